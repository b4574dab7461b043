CREATE TABLE "bulk_accepts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"accepted_by" text,
	"accepted_at" timestamp with time zone DEFAULT now() NOT NULL,
	"filter" jsonb NOT NULL,
	"entries" jsonb NOT NULL,
	"undone_by" text,
	"undone_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "lines" ADD COLUMN "last_design_version" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "bulk_accepts" ADD CONSTRAINT "bulk_accepts_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bulk_accepts" ADD CONSTRAINT "bulk_accepts_accepted_by_users_id_fk" FOREIGN KEY ("accepted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bulk_accepts" ADD CONSTRAINT "bulk_accepts_undone_by_users_id_fk" FOREIGN KEY ("undone_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "bulk_accepts_project_idx" ON "bulk_accepts" USING btree ("project_id","accepted_at");