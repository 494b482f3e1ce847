CREATE INDEX "leases_lease_code_idx" ON "leases" USING btree ("lease_code");--> statement-breakpoint
CREATE INDEX "leases_holder_idx" ON "leases" USING btree ("holder");--> statement-breakpoint
CREATE INDEX "leases_species_idx" ON "leases" USING btree ("species");--> statement-breakpoint
CREATE INDEX "leases_area_idx" ON "leases" USING btree ("area_m2");--> statement-breakpoint
CREATE INDEX "leases_created_idx" ON "leases" USING btree ("created_at");--> statement-breakpoint
CREATE INDEX "leases_status_idx" ON "leases" USING btree ("status");--> statement-breakpoint
CREATE INDEX "leases_import_idx" ON "leases" USING btree ("import_id");