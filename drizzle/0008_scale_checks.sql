CREATE TABLE "scale_checks" (
	"id" serial PRIMARY KEY NOT NULL,
	"bench_id" text NOT NULL,
	"kind" text NOT NULL,
	"state" text NOT NULL,
	"reference_g" double precision NOT NULL,
	"readability_g" double precision NOT NULL,
	"tolerance_g" double precision,
	"reading_g" double precision,
	"error_g" double precision,
	"readings" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"sd_g" double precision,
	"sd_used_g" double precision,
	"band_pct" double precision,
	"min_net_g" double precision,
	"note" text,
	"by_id" text NOT NULL,
	"by_name" text NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "check_every_hours" integer;--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "block_when_due" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "check_tolerance_g" double precision;--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "calibration_due_on" date;--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "repeatability_sd_g" double precision;--> statement-breakpoint
ALTER TABLE "benches" ADD COLUMN "repeatability_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "scale_checks" ADD CONSTRAINT "scale_checks_bench_id_benches_id_fk" FOREIGN KEY ("bench_id") REFERENCES "public"."benches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "scale_checks_bench" ON "scale_checks" USING btree ("bench_id","id");