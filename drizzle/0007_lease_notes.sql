CREATE TABLE "lease_notes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"lease_id" uuid NOT NULL,
	"author_id" text NOT NULL,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "lease_notes_body_length" CHECK (char_length("lease_notes"."body") BETWEEN 1 AND 4000)
);
--> statement-breakpoint
ALTER TABLE "lease_notes" ADD CONSTRAINT "lease_notes_lease_id_leases_id_fk" FOREIGN KEY ("lease_id") REFERENCES "public"."leases"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lease_notes" ADD CONSTRAINT "lease_notes_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "lease_notes_lease_idx" ON "lease_notes" USING btree ("lease_id","created_at");