CREATE TABLE "gauge_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"gauge_id" uuid NOT NULL,
	"observed_at" timestamp with time zone NOT NULL,
	"discharge" double precision NOT NULL,
	"source" text NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "gauges" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"river_id" uuid NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"token_hash" text,
	"location" geometry(Point,4326),
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "inbox_messages" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" text NOT NULL,
	"kind" text NOT NULL,
	"title" text NOT NULL,
	"body" text NOT NULL,
	"link" text,
	"dedupe_key" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"read_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "gauge_readings" ADD CONSTRAINT "gauge_readings_gauge_id_gauges_id_fk" FOREIGN KEY ("gauge_id") REFERENCES "public"."gauges"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauges" ADD CONSTRAINT "gauges_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inbox_messages" ADD CONSTRAINT "inbox_messages_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "gauge_readings_gauge_time_idx" ON "gauge_readings" USING btree ("gauge_id","observed_at");--> statement-breakpoint
CREATE UNIQUE INDEX "gauges_river_code_idx" ON "gauges" USING btree ("river_id","code");--> statement-breakpoint
CREATE INDEX "inbox_user_idx" ON "inbox_messages" USING btree ("user_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "inbox_user_dedupe_idx" ON "inbox_messages" USING btree ("user_id","dedupe_key");