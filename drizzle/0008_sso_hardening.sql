CREATE TABLE "domain_verifications" (
	"token_hash" text PRIMARY KEY NOT NULL,
	"organization_id" uuid NOT NULL,
	"domain" text NOT NULL,
	"sent_to" text NOT NULL,
	"requested_by" text,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "membership_blocks" (
	"organization_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"reason" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "membership_blocks_organization_id_user_id_pk" PRIMARY KEY("organization_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "signup_requests" (
	"token_hash" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"organization_name" text NOT NULL,
	"password_hash" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
-- Existing domain claims stay, unverified: company sign-in uses them again once proven.
ALTER TABLE "sso_domains" DROP CONSTRAINT "sso_domains_pkey";--> statement-breakpoint
ALTER TABLE "sso_domains" ADD CONSTRAINT "sso_domains_organization_id_domain_pk" PRIMARY KEY("organization_id","domain");--> statement-breakpoint
ALTER TABLE "pending_links" ADD COLUMN "user_id" text;--> statement-breakpoint
ALTER TABLE "pending_links" ADD COLUMN "mail_token_hash" text;--> statement-breakpoint
ALTER TABLE "sso_domains" ADD COLUMN "verified_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "sso_domains" ADD COLUMN "verified_via" text;--> statement-breakpoint
ALTER TABLE "domain_verifications" ADD CONSTRAINT "domain_verifications_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "domain_verifications" ADD CONSTRAINT "domain_verifications_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "membership_blocks" ADD CONSTRAINT "membership_blocks_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "membership_blocks" ADD CONSTRAINT "membership_blocks_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "domain_verifications_org_idx" ON "domain_verifications" USING btree ("organization_id","domain");--> statement-breakpoint
ALTER TABLE "pending_links" ADD CONSTRAINT "pending_links_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "sso_domains_verified_owner_key" ON "sso_domains" USING btree ("domain") WHERE "sso_domains"."verified_at" is not null;--> statement-breakpoint
ALTER TABLE "pending_links" ADD CONSTRAINT "pending_links_mail_token_hash_unique" UNIQUE("mail_token_hash");