CREATE TABLE "screening_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"river_id" uuid NOT NULL,
	"status" text NOT NULL,
	"total" integer DEFAULT 0 NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"message" text,
	"error" text,
	"queued_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "screening_runs" ADD CONSTRAINT "screening_runs_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "screening_runs_river_idx" ON "screening_runs" USING btree ("river_id","queued_at");