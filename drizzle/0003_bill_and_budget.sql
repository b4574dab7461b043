CREATE TABLE "boq_issues" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"issued_by" text NOT NULL,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"basis_revision" integer NOT NULL,
	"line_list_revision" integer,
	"quantities" jsonb NOT NULL,
	"counted" integer NOT NULL,
	"pending" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "budgets" (
	"project_id" uuid PRIMARY KEY NOT NULL,
	"total_kw" double precision NOT NULL,
	"total_mwh_per_year" double precision NOT NULL,
	"allocations" jsonb NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "boq_issues" ADD CONSTRAINT "boq_issues_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "boq_issues" ADD CONSTRAINT "boq_issues_issued_by_users_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budgets" ADD CONSTRAINT "budgets_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budgets" ADD CONSTRAINT "budgets_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "boq_issues_number_key" ON "boq_issues" USING btree ("project_id","number");