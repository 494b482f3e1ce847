CREATE TABLE "client_invitations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"adviser_id" text NOT NULL,
	"email" text NOT NULL,
	"grower_id" text,
	"status" text DEFAULT 'pending' NOT NULL,
	"message" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"responded_at" timestamp with time zone,
	"ended_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "client_invitations" ADD CONSTRAINT "client_invitations_adviser_id_users_id_fk" FOREIGN KEY ("adviser_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "client_invitations" ADD CONSTRAINT "client_invitations_grower_id_users_id_fk" FOREIGN KEY ("grower_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "client_invitations_adviser_idx" ON "client_invitations" USING btree ("adviser_id","status");--> statement-breakpoint
CREATE INDEX "client_invitations_email_idx" ON "client_invitations" USING btree ("email","status");--> statement-breakpoint
CREATE UNIQUE INDEX "client_invitations_open_idx" ON "client_invitations" USING btree ("adviser_id","email") WHERE status IN ('pending', 'accepted');