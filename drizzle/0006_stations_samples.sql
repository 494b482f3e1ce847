CREATE TABLE "samples" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"station_id" uuid NOT NULL,
	"sampled_at" timestamp with time zone NOT NULL,
	"salinity" double precision,
	"indicator" double precision,
	"indicator_censored" text,
	"indicator_name" text DEFAULT 'E. coli' NOT NULL,
	"method" text,
	"temperature" double precision
);
--> statement-breakpoint
CREATE TABLE "stations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text,
	"jurisdiction_id" uuid,
	"owner_id" text,
	"geom" geometry(Point,4326) NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "samples" ADD CONSTRAINT "samples_station_id_stations_id_fk" FOREIGN KEY ("station_id") REFERENCES "public"."stations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stations" ADD CONSTRAINT "stations_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "samples_station_time_idx" ON "samples" USING btree ("station_id","sampled_at");--> statement-breakpoint
CREATE UNIQUE INDEX "stations_owner_code_idx" ON "stations" USING btree ("owner_id","code");--> statement-breakpoint
CREATE INDEX "stations_geom_idx" ON "stations" USING gist ("geom");