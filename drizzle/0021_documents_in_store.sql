ALTER TABLE "design_reports" ALTER COLUMN "pdf" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "sheet_batches" ALTER COLUMN "pdf" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "design_reports" ADD COLUMN "document_key" text;--> statement-breakpoint
ALTER TABLE "design_reports" ADD COLUMN "document_bytes" integer;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD COLUMN "document_key" text;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD COLUMN "document_sha256" text;--> statement-breakpoint
ALTER TABLE "sheet_batches" ADD COLUMN "document_bytes" integer;