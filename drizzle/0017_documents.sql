ALTER TYPE "public"."job_kind" ADD VALUE IF NOT EXISTS 'sheets-batch';--> statement-breakpoint
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
CREATE TABLE "sheet_batches" (
	"job_id" uuid PRIMARY KEY NOT NULL,
	"project_id" uuid NOT NULL,
	"file_name" text NOT NULL,
	"line_count" integer NOT NULL,
	"pdf" "bytea" NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "design_reports" ADD CONSTRAINT "design_reports_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "design_reports" ADD CONSTRAINT "design_reports_issued_by_users_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD CONSTRAINT "sheet_batches_job_id_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."jobs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD CONSTRAINT "sheet_batches_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "design_reports_number_key" ON "design_reports" USING btree ("project_id","number");