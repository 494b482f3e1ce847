CREATE TABLE "calibrations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"river_id" uuid NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"options" jsonb NOT NULL,
	"start_values" jsonb NOT NULL,
	"fitted_values" jsonb NOT NULL,
	"result" jsonb NOT NULL,
	"status" text DEFAULT 'fitted' NOT NULL,
	"previous_values" jsonb,
	"applied_by" text,
	"applied_at" timestamp with time zone,
	"rolled_back_by" text,
	"rolled_back_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "samples" ADD COLUMN "indicator_unit" text DEFAULT 'per 100 mL' NOT NULL;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_river_id_rivers_id_fk" FOREIGN KEY ("river_id") REFERENCES "public"."rivers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_applied_by_users_id_fk" FOREIGN KEY ("applied_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_rolled_back_by_users_id_fk" FOREIGN KEY ("rolled_back_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "calibrations_river_idx" ON "calibrations" USING btree ("river_id","created_at");