DROP INDEX "sites_company_idx";--> statement-breakpoint
DROP INDEX "estimates_company_idx";--> statement-breakpoint
DROP INDEX "estimates_site_idx";--> statement-breakpoint
CREATE INDEX "sites_company_address_idx" ON "sites" USING btree ("company_id","address","id");--> statement-breakpoint
CREATE INDEX "estimates_company_created_idx" ON "estimates" USING btree ("company_id","created_at","id");--> statement-breakpoint
CREATE INDEX "estimates_site_created_idx" ON "estimates" USING btree ("site_id","created_at","id");