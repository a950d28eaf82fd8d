CREATE TABLE "batch_dispositions" (
	"id" serial PRIMARY KEY NOT NULL,
	"batch_id" integer NOT NULL,
	"decision" text NOT NULL,
	"reason" text,
	"by_id" text NOT NULL,
	"by_name" text NOT NULL,
	"at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_entries" (
	"id" integer PRIMARY KEY NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"actor" jsonb,
	"entity" text NOT NULL,
	"entity_id" text NOT NULL,
	"action" text NOT NULL,
	"data" jsonb NOT NULL,
	"prev_hash" text NOT NULL,
	"hash" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batch_dispositions" ADD CONSTRAINT "batch_dispositions_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "batch_dispositions_batch" ON "batch_dispositions" USING btree ("batch_id","id");--> statement-breakpoint
CREATE INDEX "audit_entries_entity" ON "audit_entries" USING btree ("entity","entity_id","id");--> statement-breakpoint
CREATE INDEX "batches_dev_up" ON "batches" USING btree (coalesce("ratio_deviation_pct", 'Infinity'::float8),"id");--> statement-breakpoint
CREATE INDEX "batches_dev_down" ON "batches" USING btree (coalesce("ratio_deviation_pct", '-Infinity'::float8),"id");--> statement-breakpoint
CREATE INDEX "batches_absdev_up" ON "batches" USING btree (coalesce(abs("ratio_deviation_pct"), 'Infinity'::float8),"id");--> statement-breakpoint
CREATE INDEX "batches_absdev_down" ON "batches" USING btree (coalesce(abs("ratio_deviation_pct"), '-Infinity'::float8),"id");