CREATE TABLE "stock_movements" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"lot_id" text NOT NULL,
	"kind" text NOT NULL,
	"delta_mg" bigint NOT NULL,
	"batch_id" integer,
	"reason" text,
	"person_id" text,
	"person_name" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "lots" ADD COLUMN "received_mg" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "materials" ADD COLUMN "also_stated_ratio" jsonb;--> statement-breakpoint
ALTER TABLE "materials" ADD COLUMN "demold_min" double precision;--> statement-breakpoint
ALTER TABLE "materials" ADD COLUMN "storage_note" text;--> statement-breakpoint
ALTER TABLE "materials" ADD COLUMN "cost_per_kg" jsonb;--> statement-breakpoint
ALTER TABLE "materials" ADD COLUMN "low_stock_g" jsonb;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_lot_id_lots_id_fk" FOREIGN KEY ("lot_id") REFERENCES "public"."lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "stock_movements_batch_lot" ON "stock_movements" USING btree ("batch_id","lot_id");--> statement-breakpoint
CREATE INDEX "stock_movements_lot" ON "stock_movements" USING btree ("lot_id");