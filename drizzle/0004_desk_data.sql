CREATE TABLE "accuracy_days" (
	"kind" text NOT NULL,
	"group_id" text NOT NULL,
	"day" timestamp with time zone NOT NULL,
	"group_name" text,
	"n" integer NOT NULL,
	"go" integer NOT NULL,
	"rescues" integer NOT NULL,
	"sum_dev" double precision NOT NULL,
	"sum_sq" double precision NOT NULL,
	"max_abs" double precision NOT NULL,
	"hist" integer[] DEFAULT array_fill(0, array[61]) NOT NULL,
	CONSTRAINT "accuracy_days_pk" PRIMARY KEY("kind","group_id","day")
);
--> statement-breakpoint
CREATE INDEX "batches_bench_created" ON "batches" USING btree ("bench_id","created_at","id");--> statement-breakpoint
CREATE INDEX "batches_lot_codes" ON "batches" USING gin ((lower(jsonb_path_query_array("detail", '$.lots[*].code')::text)::jsonb));