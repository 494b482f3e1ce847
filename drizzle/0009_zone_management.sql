ALTER TABLE "closure_zones" ADD COLUMN "river_id" uuid;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD COLUMN "gauge_id" uuid;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD COLUMN "trigger_flow" double precision;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD COLUMN "min_closure_days" double precision;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD COLUMN "indicator_standard" double precision;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD COLUMN "status" text DEFAULT 'open' NOT NULL;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD COLUMN "status_since" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD CONSTRAINT "closure_zones_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD CONSTRAINT "closure_zones_gauge_id_gauges_id_fk" FOREIGN KEY ("gauge_id") REFERENCES "public"."gauges"("id") ON DELETE set null ON UPDATE no action;