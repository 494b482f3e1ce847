CREATE TABLE "screening_run_chunks" (
	"run_id" uuid NOT NULL,
	"chunk_no" integer NOT NULL,
	"lease_ids" uuid[] NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"worker" text,
	"attempts" integer DEFAULT 0 NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	CONSTRAINT "screening_run_chunks_run_id_chunk_no_pk" PRIMARY KEY("run_id","chunk_no")
);
--> statement-breakpoint
ALTER TABLE "screening_run_chunks" ADD CONSTRAINT "screening_run_chunks_run_id_screening_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."screening_runs"("id") ON DELETE cascade ON UPDATE no action;