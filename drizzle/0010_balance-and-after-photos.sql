CREATE TYPE "public"."checkout_kind" AS ENUM('deposit', 'balance');--> statement-breakpoint
CREATE TYPE "public"."payment_method" AS ENUM('card', 'cash', 'cheque');--> statement-breakpoint
ALTER TYPE "public"."job_status" ADD VALUE 'paid';--> statement-breakpoint
CREATE TABLE "invoice_links" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"invoice_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"recipient_email" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "invoice_links_invoice_uq" UNIQUE("invoice_id"),
	CONSTRAINT "invoice_links_token_uq" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "invoice_payments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"invoice_id" uuid NOT NULL,
	"method" "payment_method" NOT NULL,
	"amount_cents" integer NOT NULL,
	"reference" text DEFAULT '' NOT NULL,
	"paid_at" timestamp with time zone NOT NULL,
	"recorded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "invoice_payments_invoice_uq" UNIQUE("invoice_id")
);
--> statement-breakpoint
ALTER TABLE "photos" ALTER COLUMN "visit_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "deposit_checkouts" ADD COLUMN "kind" "checkout_kind" DEFAULT 'deposit' NOT NULL;--> statement-breakpoint
ALTER TABLE "deposit_checkouts" ADD COLUMN "invoice_id" uuid;--> statement-breakpoint
ALTER TABLE "photos" ADD COLUMN "job_id" uuid;--> statement-breakpoint
ALTER TABLE "invoice_links" ADD CONSTRAINT "invoice_links_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice_links" ADD CONSTRAINT "invoice_links_invoice_id_invoices_id_fk" FOREIGN KEY ("invoice_id") REFERENCES "public"."invoices"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice_payments" ADD CONSTRAINT "invoice_payments_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice_payments" ADD CONSTRAINT "invoice_payments_invoice_id_invoices_id_fk" FOREIGN KEY ("invoice_id") REFERENCES "public"."invoices"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "invoice_payments" ADD CONSTRAINT "invoice_payments_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "invoice_payments_company_idx" ON "invoice_payments" USING btree ("company_id","paid_at");--> statement-breakpoint
ALTER TABLE "deposit_checkouts" ADD CONSTRAINT "deposit_checkouts_invoice_id_invoices_id_fk" FOREIGN KEY ("invoice_id") REFERENCES "public"."invoices"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_job_id_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."jobs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "photos_job_idx" ON "photos" USING btree ("job_id","created_at");--> statement-breakpoint
ALTER TABLE "photos" ADD CONSTRAINT "photos_one_owner" CHECK (num_nonnulls("photos"."visit_id", "photos"."job_id") = 1);