CREATE TABLE "result_changes" (
	"txid" "xid8" PRIMARY KEY NOT NULL,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL
);
