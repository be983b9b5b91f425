CREATE TYPE "public"."proposal_decision" AS ENUM('accepted', 'declined');--> statement-breakpoint
CREATE TYPE "public"."proposal_status" AS ENUM('open', 'accepted', 'declined', 'revoked', 'superseded');--> statement-breakpoint
CREATE TABLE "proposal_answers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"proposal_id" uuid NOT NULL,
	"decision" "proposal_decision" NOT NULL,
	"full_name" text,
	"consent" boolean DEFAULT false NOT NULL,
	"extras" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"decline_reason" text,
	"answered_at" timestamp with time zone NOT NULL,
	"ip_address" text,
	"user_agent" text,
	"proposal_version" integer NOT NULL,
	"estimate_digest" text NOT NULL,
	"total_cents" integer NOT NULL,
	"deposit_cents" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "proposal_answers_proposal_uq" UNIQUE("proposal_id")
);
--> statement-breakpoint
CREATE TABLE "proposals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"estimate_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"status" "proposal_status" DEFAULT 'open' NOT NULL,
	"token_hash" text NOT NULL,
	"estimate_digest" text NOT NULL,
	"snapshot" jsonb NOT NULL,
	"total_cents" integer NOT NULL,
	"deposit_cents" integer NOT NULL,
	"deposit_pct" real NOT NULL,
	"tax_pct" real NOT NULL,
	"valid_until" date NOT NULL,
	"recipient_email" text NOT NULL,
	"sent_by" uuid,
	"revoked_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "proposals_estimate_version_uq" UNIQUE("estimate_id","version"),
	CONSTRAINT "proposals_token_hash_uq" UNIQUE("token_hash")
);
--> statement-breakpoint
ALTER TABLE "companies" ADD COLUMN "phone" text;--> statement-breakpoint
ALTER TABLE "companies" ADD COLUMN "email" text;--> statement-breakpoint
ALTER TABLE "companies" ADD COLUMN "postal_address" text;--> statement-breakpoint
ALTER TABLE "companies" ADD COLUMN "licence" text;--> statement-breakpoint
ALTER TABLE "proposal_answers" ADD CONSTRAINT "proposal_answers_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "proposal_answers" ADD CONSTRAINT "proposal_answers_proposal_id_proposals_id_fk" FOREIGN KEY ("proposal_id") REFERENCES "public"."proposals"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "proposals" ADD CONSTRAINT "proposals_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "proposals" ADD CONSTRAINT "proposals_estimate_id_estimates_id_fk" FOREIGN KEY ("estimate_id") REFERENCES "public"."estimates"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "proposals" ADD CONSTRAINT "proposals_sent_by_users_id_fk" FOREIGN KEY ("sent_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "proposals_company_estimate_idx" ON "proposals" USING btree ("company_id","estimate_id");