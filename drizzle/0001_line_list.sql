CREATE TYPE "public"."design_source" AS ENUM('recommended', 'manual');--> statement-breakpoint
CREATE TYPE "public"."line_geometry" AS ENUM('horizontal-pipe', 'vertical-pipe', 'vessel', 'flat');--> statement-breakpoint
CREATE TABLE "column_mappings" (
	"project_id" uuid PRIMARY KEY NOT NULL,
	"headers" jsonb NOT NULL,
	"mapping" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "design_bases" (
	"project_id" uuid PRIMARY KEY NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"basis" jsonb NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "import_drafts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"created_by" text NOT NULL,
	"file_name" text NOT NULL,
	"parsed" jsonb NOT NULL,
	"imported_revision" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "line_designs" (
	"line_id" uuid PRIMARY KEY NOT NULL,
	"project_id" uuid NOT NULL,
	"thickness_mm" double precision NOT NULL,
	"layers" jsonb NOT NULL,
	"source" "design_source" NOT NULL,
	"reason" text,
	"below_criterion" text,
	"needs_redecision" boolean DEFAULT false NOT NULL,
	"redecision_reason" text,
	"decided_by" text,
	"decided_at" timestamp with time zone DEFAULT now() NOT NULL,
	"version" integer DEFAULT 1 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "line_list_revisions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"file_name" text NOT NULL,
	"sheet_name" text NOT NULL,
	"line_count" integer NOT NULL,
	"diff" jsonb NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "line_results" (
	"line_id" uuid PRIMARY KEY NOT NULL,
	"project_id" uuid NOT NULL,
	"calc_version" text NOT NULL,
	"basis_revision" integer NOT NULL,
	"input_version" integer NOT NULL,
	"input_hash" text NOT NULL,
	"recommended_mm" double precision,
	"governing" text,
	"layers" jsonb NOT NULL,
	"system_label" text NOT NULL,
	"jacket_id" text NOT NULL,
	"outcomes" jsonb NOT NULL,
	"candidates" jsonb NOT NULL,
	"unmet" text[] NOT NULL,
	"warnings" jsonb NOT NULL,
	"design" jsonb,
	"heat_flow_per_unit" double precision,
	"total_heat_w" double precision,
	"bare_heat_w" double precision NOT NULL,
	"surface_temp_c" double precision,
	"personnel_surface_c" double precision,
	"annual_mwh" double precision,
	"annual_cost" double precision,
	"co2_tonnes" double precision,
	"condensate_kg_per_h" double precision,
	"solved_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"project_id" uuid NOT NULL,
	"tag" text NOT NULL,
	"service" text DEFAULT '' NOT NULL,
	"area" text DEFAULT '' NOT NULL,
	"geometry" "line_geometry" NOT NULL,
	"nps" text,
	"outside_diameter_mm" double precision,
	"length_m" double precision,
	"surface_area_m2" double precision,
	"height_m" double precision,
	"normal_temp_c" double precision NOT NULL,
	"max_temp_c" double precision,
	"steam_pressure_bar_g" double precision,
	"flow_kg_per_s" double precision,
	"fluid_cp_kj_per_kg_k" double precision,
	"elbows" integer DEFAULT 0 NOT NULL,
	"tees" integer DEFAULT 0 NOT NULL,
	"valves" integer DEFAULT 0 NOT NULL,
	"flanges" integer DEFAULT 0 NOT NULL,
	"purposes" text[] NOT NULL,
	"outdoor" boolean DEFAULT true NOT NULL,
	"accessible" boolean DEFAULT true NOT NULL,
	"access_height_m" double precision,
	"jacket_id" text,
	"notes" text DEFAULT '' NOT NULL,
	"input_version" integer DEFAULT 1 NOT NULL,
	"revision" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "column_mappings" ADD CONSTRAINT "column_mappings_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "design_bases" ADD CONSTRAINT "design_bases_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "design_bases" ADD CONSTRAINT "design_bases_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_drafts" ADD CONSTRAINT "import_drafts_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_drafts" ADD CONSTRAINT "import_drafts_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_designs" ADD CONSTRAINT "line_designs_line_id_lines_id_fk" FOREIGN KEY ("line_id") REFERENCES "public"."lines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_designs" ADD CONSTRAINT "line_designs_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_designs" ADD CONSTRAINT "line_designs_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_list_revisions" ADD CONSTRAINT "line_list_revisions_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_list_revisions" ADD CONSTRAINT "line_list_revisions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_results" ADD CONSTRAINT "line_results_line_id_lines_id_fk" FOREIGN KEY ("line_id") REFERENCES "public"."lines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "line_results" ADD CONSTRAINT "line_results_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lines" ADD CONSTRAINT "lines_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "line_designs_project_idx" ON "line_designs" USING btree ("project_id");--> statement-breakpoint
CREATE UNIQUE INDEX "line_list_revisions_number_key" ON "line_list_revisions" USING btree ("project_id","number");--> statement-breakpoint
CREATE INDEX "line_results_project_idx" ON "line_results" USING btree ("project_id");--> statement-breakpoint
CREATE UNIQUE INDEX "lines_project_tag_key" ON "lines" USING btree ("project_id","tag");--> statement-breakpoint
CREATE INDEX "lines_project_area_idx" ON "lines" USING btree ("project_id","area");