CREATE TABLE "column_mappings" (
	"company_id" uuid NOT NULL,
	"header_key" text NOT NULL,
	"mapping" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "column_mappings_company_id_header_key_pk" PRIMARY KEY("company_id","header_key")
);
--> statement-breakpoint
CREATE TABLE "import_batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"user_id" uuid,
	"file_name" text NOT NULL,
	"status" text DEFAULT 'committed' NOT NULL,
	"mapping" jsonb NOT NULL,
	"row_count" integer NOT NULL,
	"inserted_count" integer DEFAULT 0 NOT NULL,
	"updated_count" integer DEFAULT 0 NOT NULL,
	"unchanged_count" integer DEFAULT 0 NOT NULL,
	"rejected_count" integer DEFAULT 0 NOT NULL,
	"errors" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"undone_at" timestamp with time zone,
	CONSTRAINT "import_batches_status" CHECK (status in ('committed', 'undone'))
);
--> statement-breakpoint
CREATE TABLE "import_changes" (
	"batch_id" uuid NOT NULL,
	"home_id" uuid NOT NULL,
	"action" text NOT NULL,
	"previous" jsonb,
	CONSTRAINT "import_changes_batch_id_home_id_pk" PRIMARY KEY("batch_id","home_id"),
	CONSTRAINT "import_changes_action" CHECK (action in ('inserted', 'updated', 'unchanged'))
);
--> statement-breakpoint
CREATE TABLE "quotes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"community_id" uuid NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"homes_total" integer NOT NULL,
	"homes_sampled" integer NOT NULL,
	"failures_sampled" integer NOT NULL,
	"prior_alpha" double precision NOT NULL,
	"prior_beta" double precision NOT NULL,
	"pooled" boolean DEFAULT false NOT NULL,
	"confidence" double precision NOT NULL,
	"activation_price_cents" integer NOT NULL,
	"rework_price_cents" integer NOT NULL,
	"expected_reworks" double precision NOT NULL,
	"upper_reworks" integer NOT NULL,
	"price_expected_cents" integer NOT NULL,
	"price_upper_cents" integer NOT NULL,
	"recipient_email" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_by" uuid,
	"approved_at" timestamp with time zone,
	"sent_at" timestamp with time zone,
	"decided_at" timestamp with time zone,
	CONSTRAINT "quotes_status" CHECK (status in ('draft', 'approved', 'sent', 'accepted', 'declined')),
	CONSTRAINT "quotes_counts" CHECK ("quotes"."homes_sampled" >= 0 and "quotes"."failures_sampled" >= 0 and "quotes"."failures_sampled" <= "quotes"."homes_sampled" and "quotes"."homes_sampled" <= "quotes"."homes_total")
);
--> statement-breakpoint
CREATE TABLE "sampling_plan_homes" (
	"plan_id" uuid NOT NULL,
	"home_id" uuid NOT NULL,
	CONSTRAINT "sampling_plan_homes_plan_id_home_id_pk" PRIMARY KEY("plan_id","home_id")
);
--> statement-breakpoint
CREATE TABLE "sampling_plans" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"community_id" uuid NOT NULL,
	"margin_of_error" double precision NOT NULL,
	"expected_rate" double precision NOT NULL,
	"sample_size" integer NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sampling_plans_margin" CHECK ("sampling_plans"."margin_of_error" > 0 and "sampling_plans"."margin_of_error" < 1),
	CONSTRAINT "sampling_plans_rate" CHECK ("sampling_plans"."expected_rate" >= 0 and "sampling_plans"."expected_rate" <= 1),
	CONSTRAINT "sampling_plans_size" CHECK ("sampling_plans"."sample_size" >= 0)
);
--> statement-breakpoint
ALTER TABLE "column_mappings" ADD CONSTRAINT "column_mappings_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_batches" ADD CONSTRAINT "import_batches_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_batches" ADD CONSTRAINT "import_batches_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_changes" ADD CONSTRAINT "import_changes_batch_id_import_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."import_batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_community_id_communities_id_fk" FOREIGN KEY ("community_id") REFERENCES "public"."communities"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "quotes" ADD CONSTRAINT "quotes_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sampling_plan_homes" ADD CONSTRAINT "sampling_plan_homes_plan_id_sampling_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."sampling_plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sampling_plan_homes" ADD CONSTRAINT "sampling_plan_homes_home_id_homes_id_fk" FOREIGN KEY ("home_id") REFERENCES "public"."homes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sampling_plans" ADD CONSTRAINT "sampling_plans_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sampling_plans" ADD CONSTRAINT "sampling_plans_community_id_communities_id_fk" FOREIGN KEY ("community_id") REFERENCES "public"."communities"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sampling_plans" ADD CONSTRAINT "sampling_plans_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "import_batches_company_idx" ON "import_batches" USING btree ("company_id","created_at");--> statement-breakpoint
CREATE INDEX "import_changes_home_idx" ON "import_changes" USING btree ("home_id");--> statement-breakpoint
CREATE INDEX "quotes_company_idx" ON "quotes" USING btree ("company_id","created_at");--> statement-breakpoint
CREATE INDEX "sampling_plan_homes_home_idx" ON "sampling_plan_homes" USING btree ("home_id");--> statement-breakpoint
CREATE INDEX "sampling_plans_company_community_idx" ON "sampling_plans" USING btree ("company_id","community_id");