CREATE TABLE "lots" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"material_id" text NOT NULL,
	"part" integer NOT NULL,
	"code" text NOT NULL,
	"expires_on" date,
	"opened_on" date,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "materials" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"name" text NOT NULL,
	"ratio_basis" text NOT NULL,
	"ratio_parts" jsonb NOT NULL,
	"specific_gravity" double precision,
	"yield_in3_per_lb" double precision,
	"part_specific_gravities" jsonb,
	"part_labels" jsonb,
	"tolerance_pct" double precision NOT NULL,
	"pot_life_min" double precision,
	"pot_life_mass_g" double precision,
	"agitate_min" double precision DEFAULT 0 NOT NULL,
	"cautions" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"sds_ref" text,
	"open_shelf_life_days" integer,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "batches" (
	"id" serial PRIMARY KEY NOT NULL,
	"bench_id" text NOT NULL,
	"operator_id" text NOT NULL,
	"operator_name" text NOT NULL,
	"material_id" text NOT NULL,
	"material_name" text NOT NULL,
	"state" text NOT NULL,
	"resume_state" text,
	"verdict" text,
	"total_mass_g" double precision NOT NULL,
	"weight_ratio" jsonb NOT NULL,
	"tolerance_pct" double precision NOT NULL,
	"readability_g" double precision NOT NULL,
	"detail" jsonb NOT NULL,
	"ratio_deviation_pct" double precision,
	"abandon_reason" text,
	"interrupted_reason" text,
	"trace" "bytea",
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"saved_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "badge_locks" (
	"badge_hash" text PRIMARY KEY NOT NULL,
	"failures" integer DEFAULT 0 NOT NULL,
	"locked_until" timestamp with time zone,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "people" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"name" text NOT NULL,
	"role" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"email" text,
	"password_hash" text,
	"badge_hash" text,
	"pin_hash" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "revoked_tokens" (
	"token_id" text PRIMARY KEY NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "lots" ADD CONSTRAINT "lots_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_bench_id_benches_id_fk" FOREIGN KEY ("bench_id") REFERENCES "public"."benches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "lots_material_part_code" ON "lots" USING btree ("material_id","part","code");--> statement-breakpoint
CREATE INDEX "batches_bench_state" ON "batches" USING btree ("bench_id","state");--> statement-breakpoint
CREATE INDEX "batches_created" ON "batches" USING btree ("created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "people_email_unique" ON "people" USING btree ("email");--> statement-breakpoint
CREATE UNIQUE INDEX "people_badge_hash_unique" ON "people" USING btree ("badge_hash");