CREATE TYPE "public"."import_status" AS ENUM('needs-crs', 'ready', 'confirmed');--> statement-breakpoint
CREATE TYPE "public"."lease_status" AS ENUM('held', 'candidate');--> statement-breakpoint
CREATE TYPE "public"."upload_kind" AS ENUM('lease', 'coast', 'zone');--> statement-breakpoint
CREATE TABLE "closure_zones" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"jurisdiction_id" uuid NOT NULL,
	"import_id" uuid,
	"source_properties" jsonb,
	"geom" geometry(MultiPolygon,4326) NOT NULL,
	"area_m2" double precision NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "coasts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"form" text NOT NULL,
	"owner_id" text,
	"jurisdiction_id" uuid,
	"shared" boolean DEFAULT false NOT NULL,
	"import_id" uuid,
	"geom" geometry(Geometry,4326) NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "import_features" (
	"import_id" uuid NOT NULL,
	"feature_index" integer NOT NULL,
	"layer" text NOT NULL,
	"properties" jsonb NOT NULL,
	"geom" geometry(Geometry,4326) NOT NULL,
	"repaired" boolean DEFAULT false NOT NULL,
	"invalid_reason" text,
	"area_m2" double precision,
	"on_land" boolean DEFAULT false NOT NULL,
	CONSTRAINT "import_features_import_id_feature_index_pk" PRIMARY KEY("import_id","feature_index")
);
--> statement-breakpoint
CREATE TABLE "imports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"kind" "upload_kind" NOT NULL,
	"owner_id" text NOT NULL,
	"jurisdiction_id" uuid,
	"file_name" text NOT NULL,
	"file_sha256" text NOT NULL,
	"file_bytes" "bytea" NOT NULL,
	"status" "import_status" NOT NULL,
	"crs" jsonb NOT NULL,
	"parsed_source" jsonb,
	"summary" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"confirmed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "lease_shares" (
	"lease_id" uuid NOT NULL,
	"grantee_id" text NOT NULL,
	"granted_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lease_shares_lease_id_grantee_id_pk" PRIMARY KEY("lease_id","grantee_id")
);
--> statement-breakpoint
CREATE TABLE "leases" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lease_code" text NOT NULL,
	"holder" text,
	"species" text,
	"status" "lease_status" DEFAULT 'held' NOT NULL,
	"notes" text,
	"owner_id" text NOT NULL,
	"organisation_id" uuid,
	"jurisdiction_id" uuid,
	"import_id" uuid,
	"source_properties" jsonb,
	"geom" geometry(MultiPolygon,4326) NOT NULL,
	"area_m2" double precision NOT NULL,
	"on_land" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "closure_zones" ADD CONSTRAINT "closure_zones_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "closure_zones" ADD CONSTRAINT "closure_zones_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "coasts" ADD CONSTRAINT "coasts_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "coasts" ADD CONSTRAINT "coasts_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "coasts" ADD CONSTRAINT "coasts_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_features" ADD CONSTRAINT "import_features_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "imports" ADD CONSTRAINT "imports_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "imports" ADD CONSTRAINT "imports_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lease_shares" ADD CONSTRAINT "lease_shares_lease_id_leases_id_fk" FOREIGN KEY ("lease_id") REFERENCES "public"."leases"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lease_shares" ADD CONSTRAINT "lease_shares_grantee_id_users_id_fk" FOREIGN KEY ("grantee_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "leases" ADD CONSTRAINT "leases_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "leases" ADD CONSTRAINT "leases_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "leases" ADD CONSTRAINT "leases_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "leases" ADD CONSTRAINT "leases_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "closure_zones_geom_idx" ON "closure_zones" USING gist ("geom");--> statement-breakpoint
CREATE INDEX "coasts_geom_idx" ON "coasts" USING gist ("geom");--> statement-breakpoint
CREATE INDEX "imports_owner_idx" ON "imports" USING btree ("owner_id");--> statement-breakpoint
CREATE INDEX "lease_shares_grantee_idx" ON "lease_shares" USING btree ("grantee_id");--> statement-breakpoint
CREATE INDEX "leases_geom_idx" ON "leases" USING gist ("geom");--> statement-breakpoint
CREATE INDEX "leases_owner_idx" ON "leases" USING btree ("owner_id");--> statement-breakpoint
CREATE INDEX "leases_jurisdiction_status_idx" ON "leases" USING btree ("jurisdiction_id","status");--> statement-breakpoint
CREATE INDEX "leases_code_idx" ON "leases" USING btree ("owner_id","lease_code");