ALTER TYPE "public"."job_kind" ADD VALUE 'read-upload';--> statement-breakpoint
ALTER TYPE "public"."job_kind" ADD VALUE 'check-import';--> statement-breakpoint
ALTER TYPE "public"."job_kind" ADD VALUE 'what-if';