CREATE TABLE "notice_zones" (
	"notice_id" uuid NOT NULL,
	"zone_id" uuid NOT NULL,
	"status_before" text NOT NULL,
	"status_after" text NOT NULL,
	CONSTRAINT "notice_zones_notice_id_zone_id_pk" PRIMARY KEY("notice_id","zone_id")
);
--> statement-breakpoint
CREATE TABLE "notices" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"jurisdiction_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"message" text,
	"flow" double precision,
	"issued_by" text NOT NULL,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"recipients" integer DEFAULT 0 NOT NULL,
	"emails_sent" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "zone_samples" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"zone_id" uuid NOT NULL,
	"sampled_at" timestamp with time zone NOT NULL,
	"indicator" double precision NOT NULL,
	"standard" double precision NOT NULL,
	"passed" boolean NOT NULL,
	"notes" text,
	"entered_by" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "notice_zones" ADD CONSTRAINT "notice_zones_notice_id_notices_id_fk" FOREIGN KEY ("notice_id") REFERENCES "public"."notices"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notice_zones" ADD CONSTRAINT "notice_zones_zone_id_closure_zones_id_fk" FOREIGN KEY ("zone_id") REFERENCES "public"."closure_zones"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notices" ADD CONSTRAINT "notices_jurisdiction_id_jurisdictions_id_fk" FOREIGN KEY ("jurisdiction_id") REFERENCES "public"."jurisdictions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notices" ADD CONSTRAINT "notices_issued_by_users_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "zone_samples" ADD CONSTRAINT "zone_samples_zone_id_closure_zones_id_fk" FOREIGN KEY ("zone_id") REFERENCES "public"."closure_zones"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "zone_samples" ADD CONSTRAINT "zone_samples_entered_by_users_id_fk" FOREIGN KEY ("entered_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "notice_zones_zone_idx" ON "notice_zones" USING btree ("zone_id");--> statement-breakpoint
CREATE INDEX "notices_jurisdiction_idx" ON "notices" USING btree ("jurisdiction_id","issued_at");--> statement-breakpoint
CREATE INDEX "zone_samples_zone_idx" ON "zone_samples" USING btree ("zone_id","sampled_at");