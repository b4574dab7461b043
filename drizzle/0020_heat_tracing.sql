ALTER TABLE "line_results" ADD COLUMN "tracing" jsonb;--> statement-breakpoint
ALTER TABLE "lines" ADD COLUMN "heat_traced" boolean DEFAULT false NOT NULL;