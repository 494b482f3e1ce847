CREATE TABLE "flow_readings" (
	"record_id" uuid NOT NULL,
	"t" timestamp with time zone NOT NULL,
	"discharge" double precision NOT NULL,
	CONSTRAINT "flow_readings_record_id_t_pk" PRIMARY KEY("record_id","t")
);
--> statement-breakpoint
CREATE TABLE "flow_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"river_id" uuid NOT NULL,
	"file_name" text NOT NULL,
	"units" text NOT NULL,
	"water_year_start" text DEFAULT '10-01' NOT NULL,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"reading_count" integer NOT NULL,
	"first_time" timestamp with time zone,
	"last_time" timestamp with time zone,
	"interval" text NOT NULL,
	"problems" jsonb NOT NULL,
	"gaps" jsonb NOT NULL,
	"annual_peaks" jsonb NOT NULL,
	"fit" jsonb,
	"durations" jsonb,
	"percentiles" jsonb,
	"active" boolean DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE TABLE "footprint_band_pieces" (
	"footprint_id" uuid NOT NULL,
	"band_id" text NOT NULL,
	"geom" geometry(Geometry,4326) NOT NULL
);
--> statement-breakpoint
CREATE TABLE "footprint_bands" (
	"footprint_id" uuid NOT NULL,
	"band_id" text NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"threshold" double precision,
	"sort_order" integer NOT NULL,
	"geom" geometry(MultiPolygon,4326) NOT NULL,
	CONSTRAINT "footprint_bands_footprint_id_band_id_pk" PRIMARY KEY("footprint_id","band_id")
);
--> statement-breakpoint
CREATE TABLE "footprints" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"river_id" uuid NOT NULL,
	"scenario_id" uuid,
	"discharge" double precision NOT NULL,
	"duration_hours" double precision NOT NULL,
	"model_version" text NOT NULL,
	"input_hash" text NOT NULL,
	"plume" jsonb NOT NULL,
	"warnings" jsonb NOT NULL,
	"path" geometry(Geometry,4326),
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "lease_annual_exposure" (
	"lease_id" uuid NOT NULL,
	"river_id" uuid NOT NULL,
	"expected_days_per_year" double precision NOT NULL,
	"probability_any_exposure" double precision NOT NULL,
	"worst_rating" text NOT NULL,
	"details" jsonb,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lease_annual_exposure_lease_id_river_id_pk" PRIMARY KEY("lease_id","river_id")
);
--> statement-breakpoint
CREATE TABLE "rivers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"jurisdiction_id" uuid,
	"owner_id" text,
	"settings" jsonb NOT NULL,
	"defaults_used" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"mouth" geometry(Point,4326) NOT NULL,
	"coast_id" uuid,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "scenarios" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"river_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"aep" double precision,
	"discharge" double precision NOT NULL,
	"duration_hours" double precision NOT NULL,
	"source" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "screenings" (
	"lease_id" uuid NOT NULL,
	"scenario_id" uuid NOT NULL,
	"footprint_id" uuid NOT NULL,
	"river_id" uuid NOT NULL,
	"band_fractions" jsonb NOT NULL,
	"lowest_salinity" double precision,
	"highest_indicator" double precision,
	"days_below_tolerance" double precision NOT NULL,
	"rating" text NOT NULL,
	"score" double precision NOT NULL,
	"reasons" jsonb NOT NULL,
	"numbers" jsonb NOT NULL,
	"model_version" text NOT NULL,
	"input_hash" text NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "screenings_lease_id_scenario_id_pk" PRIMARY KEY("lease_id","scenario_id")
);
--> statement-breakpoint
ALTER TABLE "flow_readings" ADD CONSTRAINT "flow_readings_record_id_flow_records_id_fk" FOREIGN KEY ("record_id") REFERENCES "public"."flow_records"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flow_records" ADD CONSTRAINT "flow_records_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flow_records" ADD CONSTRAINT "flow_records_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "footprint_band_pieces" ADD CONSTRAINT "footprint_band_pieces_footprint_id_footprints_id_fk" FOREIGN KEY ("footprint_id") REFERENCES "public"."footprints"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "footprint_bands" ADD CONSTRAINT "footprint_bands_footprint_id_footprints_id_fk" FOREIGN KEY ("footprint_id") REFERENCES "public"."footprints"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "footprints" ADD CONSTRAINT "footprints_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "footprints" ADD CONSTRAINT "footprints_scenario_id_scenarios_id_fk" FOREIGN KEY ("scenario_id") REFERENCES "public"."scenarios"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lease_annual_exposure" ADD CONSTRAINT "lease_annual_exposure_lease_id_leases_id_fk" FOREIGN KEY ("lease_id") REFERENCES "public"."leases"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lease_annual_exposure" ADD CONSTRAINT "lease_annual_exposure_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rivers" ADD CONSTRAINT "rivers_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rivers" ADD CONSTRAINT "rivers_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rivers" ADD CONSTRAINT "rivers_coast_id_coasts_id_fk" FOREIGN KEY ("coast_id") REFERENCES "public"."coasts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "screenings" ADD CONSTRAINT "screenings_lease_id_leases_id_fk" FOREIGN KEY ("lease_id") REFERENCES "public"."leases"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "screenings" ADD CONSTRAINT "screenings_scenario_id_scenarios_id_fk" FOREIGN KEY ("scenario_id") REFERENCES "public"."scenarios"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "screenings" ADD CONSTRAINT "screenings_footprint_id_footprints_id_fk" FOREIGN KEY ("footprint_id") REFERENCES "public"."footprints"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "screenings" ADD CONSTRAINT "screenings_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "footprint_band_pieces_geom_idx" ON "footprint_band_pieces" USING gist ("geom");--> statement-breakpoint
CREATE INDEX "footprint_band_pieces_fp_idx" ON "footprint_band_pieces" USING btree ("footprint_id");--> statement-breakpoint
CREATE INDEX "footprint_bands_geom_idx" ON "footprint_bands" USING gist ("geom");--> statement-breakpoint
CREATE UNIQUE INDEX "footprints_river_hash_idx" ON "footprints" USING btree ("river_id","input_hash");--> statement-breakpoint
CREATE INDEX "footprints_scenario_idx" ON "footprints" USING btree ("scenario_id");--> statement-breakpoint
CREATE INDEX "rivers_jurisdiction_idx" ON "rivers" USING btree ("jurisdiction_id");--> statement-breakpoint
CREATE INDEX "scenarios_river_idx" ON "scenarios" USING btree ("river_id");--> statement-breakpoint
CREATE INDEX "screenings_river_idx" ON "screenings" USING btree ("river_id");--> statement-breakpoint
CREATE INDEX "screenings_rating_idx" ON "screenings" USING btree ("rating");