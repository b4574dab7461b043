CREATE TABLE "line_comments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"line_id" uuid NOT NULL,
	"parent_id" uuid,
	"author_id" text,
	"author_name" text NOT NULL,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "design_reports" ALTER COLUMN "pdf" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "sheet_batches" ALTER COLUMN "pdf" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "design_reports" ADD COLUMN "document_key" text;--> statement-breakpoint
ALTER TABLE "design_reports" ADD COLUMN "document_bytes" integer;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD COLUMN "document_key" text;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD COLUMN "document_sha256" text;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD COLUMN "document_bytes" integer;--> statement-breakpoint
ALTER TABLE "line_comments" ADD CONSTRAINT "line_comments_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_comments" ADD CONSTRAINT "line_comments_line_id_lines_id_fk" FOREIGN KEY ("line_id") REFERENCES "public"."lines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_comments" ADD CONSTRAINT "line_comments_parent_id_line_comments_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."line_comments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_comments" ADD CONSTRAINT "line_comments_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "line_comments_line_idx" ON "line_comments" USING btree ("line_id","created_at");