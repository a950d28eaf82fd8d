CREATE INDEX "batches_dev_up" ON "batches" USING btree (coalesce("ratio_deviation_pct", 'Infinity'::float8),"id");--> statement-breakpoint
CREATE INDEX "batches_dev_down" ON "batches" USING btree (coalesce("ratio_deviation_pct", '-Infinity'::float8),"id");--> statement-breakpoint
CREATE INDEX "batches_absdev_up" ON "batches" USING btree (coalesce(abs("ratio_deviation_pct"), 'Infinity'::float8),"id");--> statement-breakpoint
CREATE INDEX "batches_absdev_down" ON "batches" USING btree (coalesce(abs("ratio_deviation_pct"), '-Infinity'::float8),"id");