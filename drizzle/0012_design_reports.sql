CREATE TABLE "design_reports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"issued_by" text NOT NULL,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"basis_revision" integer NOT NULL,
	"line_list_revision" integer,
	"calc_version" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"summary" jsonb NOT NULL,
	"sha256" text NOT NULL,
	"pdf" "bytea" NOT NULL
);
--> statement-breakpoint
ALTER TABLE "design_reports" ADD CONSTRAINT "design_reports_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "design_reports" ADD CONSTRAINT "design_reports_issued_by_users_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "design_reports_number_key" ON "design_reports" USING btree ("project_id","number");