ALTER TABLE "boq_issues" ADD COLUMN "document_key" text;--> statement-breakpoint
ALTER TABLE "boq_issues" ADD COLUMN "document_sha256" text;--> statement-breakpoint
ALTER TABLE "boq_issues" ADD COLUMN "document_bytes" integer;--> statement-breakpoint
ALTER TABLE "import_drafts" ADD COLUMN "original_key" text;--> statement-breakpoint
ALTER TABLE "import_drafts" ADD COLUMN "original_sha256" text;--> statement-breakpoint
ALTER TABLE "import_drafts" ADD COLUMN "original_bytes" integer;--> statement-breakpoint
ALTER TABLE "line_list_revisions" ADD COLUMN "original_key" text;--> statement-breakpoint
ALTER TABLE "line_list_revisions" ADD COLUMN "original_sha256" text;--> statement-breakpoint
ALTER TABLE "line_list_revisions" ADD COLUMN "original_bytes" integer;