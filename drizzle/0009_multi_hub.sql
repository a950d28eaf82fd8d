CREATE TABLE "hubs" (
	"id" text PRIMARY KEY NOT NULL,
	"internal_url" text,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"heartbeat_at" timestamp with time zone DEFAULT now() NOT NULL,
	"down_noted_at" timestamp with time zone,
	"scales" jsonb DEFAULT '{}'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "socket_io_attachments" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"payload" "bytea"
);
--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "hub_id" text;