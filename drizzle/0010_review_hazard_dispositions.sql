ALTER TYPE "public"."review_disposition" ADD VALUE 'vapour-retarder-repair';--> statement-breakpoint
ALTER TYPE "public"."review_disposition" ADD VALUE 'drip-protection';--> statement-breakpoint
ALTER TABLE "review_items" ADD COLUMN "carried_from_round" integer;