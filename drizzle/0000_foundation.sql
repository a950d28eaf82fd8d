CREATE TABLE "benches" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"scale_url" text,
	"pin_required" boolean DEFAULT false NOT NULL,
	"idle_sign_out_min" integer DEFAULT 5 NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
