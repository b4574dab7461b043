ALTER TABLE "import_drafts" ALTER COLUMN "parsed" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "line_results" ALTER COLUMN "layers" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "line_results" ALTER COLUMN "outcomes" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "line_results" ALTER COLUMN "candidates" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "line_results" ALTER COLUMN "warnings" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "line_results" ALTER COLUMN "design" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "line_results" ALTER COLUMN "tracing" SET DATA TYPE json;--> statement-breakpoint
-- A narrow heap: the result documents are moved out of the row (TOAST) as soon as a row passes 128
-- bytes, so the line table's sorts and counts scan the figures, not the candidate tables.
ALTER TABLE "line_results" SET (toast_tuple_target = 128);--> statement-breakpoint
-- lz4 compresses the large documents several times faster than the default (pglz); skipped where
-- PostgreSQL was built without it.
DO $$ BEGIN
  ALTER TABLE "line_results" ALTER COLUMN "candidates" SET COMPRESSION lz4, ALTER COLUMN "outcomes" SET COMPRESSION lz4,
    ALTER COLUMN "design" SET COMPRESSION lz4, ALTER COLUMN "tracing" SET COMPRESSION lz4;
  ALTER TABLE "import_drafts" ALTER COLUMN "parsed" SET COMPRESSION lz4;
EXCEPTION WHEN feature_not_supported THEN NULL;
END $$;
