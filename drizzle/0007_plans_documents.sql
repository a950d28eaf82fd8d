CREATE TABLE "pour_plans" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"name" text NOT NULL,
	"mold_ref" text,
	"material_id" text NOT NULL,
	"estimate" jsonb NOT NULL,
	"total_mass_g" double precision NOT NULL,
	"created_by_id" text NOT NULL,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "material_documents" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"material_id" text NOT NULL,
	"kind" text NOT NULL,
	"file_name" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by_id" text NOT NULL,
	"uploaded_by_name" text NOT NULL,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batches" ADD COLUMN "plan_id" text;--> statement-breakpoint
ALTER TABLE "pour_plans" ADD CONSTRAINT "pour_plans_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "material_documents" ADD CONSTRAINT "material_documents_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "material_documents_material" ON "material_documents" USING btree ("material_id","kind","uploaded_at");--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_plan_id_pour_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."pour_plans"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "batches_plan" ON "batches" USING btree ("plan_id","created_at");