ALTER TABLE "coasts" ADD COLUMN "source" text DEFAULT 'upload' NOT NULL;--> statement-breakpoint
ALTER TABLE "coasts" ADD COLUMN "window" geometry(Geometry,4326);--> statement-breakpoint
ALTER TABLE "coasts" ADD COLUMN "sea" geometry(Geometry,4326);--> statement-breakpoint
ALTER TABLE "jurisdictions" ADD COLUMN "area" geometry(MultiPolygon,4326);--> statement-breakpoint
CREATE INDEX "coasts_window_idx" ON "coasts" USING gist ("window");