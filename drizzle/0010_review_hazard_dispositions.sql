ALTER TYPE "public"."review_disposition" ADD VALUE IF NOT EXISTS 'vapour-retarder-repair';--> statement-breakpoint
ALTER TYPE "public"."review_disposition" ADD VALUE IF NOT EXISTS 'drip-protection';--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "carried_from_round" integer;