CREATE TABLE "attachments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"home_id" uuid NOT NULL,
	"visit_id" uuid,
	"radon_test_id" uuid,
	"kind" text NOT NULL,
	"content_type" text NOT NULL,
	"byte_size" integer NOT NULL,
	"storage_key" text NOT NULL,
	"original_name" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "attachments_kind" CHECK (kind in ('photo', 'lab_report')),
	CONSTRAINT "attachments_size_positive" CHECK ("attachments"."byte_size" > 0)
);
--> statement-breakpoint
CREATE TABLE "builders" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"name" text NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "communities" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"name" text NOT NULL,
	"boundary" geometry(MultiPolygon,4326),
	"year_from" integer,
	"year_to" integer,
	"jurisdiction" text DEFAULT '' NOT NULL,
	"passive_required" boolean,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "communities_years_in_order" CHECK ("communities"."year_from" is null or "communities"."year_to" is null or "communities"."year_from" <= "communities"."year_to")
);
--> statement-breakpoint
CREATE TABLE "community_builders" (
	"community_id" uuid NOT NULL,
	"builder_id" uuid NOT NULL,
	CONSTRAINT "community_builders_community_id_builder_id_pk" PRIMARY KEY("community_id","builder_id")
);
--> statement-breakpoint
CREATE TABLE "companies" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"action_level_bq_m3" double precision DEFAULT 148 NOT NULL,
	"consider_level_bq_m3" double precision DEFAULT 74 NOT NULL,
	"radon_unit" text DEFAULT 'pCi/L' NOT NULL,
	"activation_price_cents" integer DEFAULT 95000 NOT NULL,
	"rework_price_cents" integer DEFAULT 65000 NOT NULL,
	"quote_confidence" double precision DEFAULT 0.9 NOT NULL,
	"pfe_target_pa" double precision DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "companies_action_level_positive" CHECK ("companies"."action_level_bq_m3" > 0),
	CONSTRAINT "companies_consider_level_positive" CHECK ("companies"."consider_level_bq_m3" > 0),
	CONSTRAINT "companies_radon_unit" CHECK (radon_unit in ('pCi/L', 'Bq/m3')),
	CONSTRAINT "companies_prices_non_negative" CHECK ("companies"."activation_price_cents" >= 0 and "companies"."rework_price_cents" >= 0),
	CONSTRAINT "companies_quote_confidence" CHECK ("companies"."quote_confidence" > 0 and "companies"."quote_confidence" < 1),
	CONSTRAINT "companies_pfe_target_positive" CHECK ("companies"."pfe_target_pa" > 0)
);
--> statement-breakpoint
CREATE TABLE "fans" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"name" text NOT NULL,
	"max_static_in_wc" double precision NOT NULL,
	"curve" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "fans_max_static_positive" CHECK ("fans"."max_static_in_wc" > 0)
);
--> statement-breakpoint
CREATE TABLE "homes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"community_id" uuid,
	"builder_id" uuid,
	"number" text NOT NULL,
	"street" text NOT NULL,
	"unit" text,
	"city" text NOT NULL,
	"state" text NOT NULL,
	"zip" text NOT NULL,
	"address_key" text NOT NULL,
	"location" geometry(Point,4326) NOT NULL,
	"year_built" integer,
	"foundation" text,
	"passive_system" text DEFAULT 'unknown' NOT NULL,
	"pipe_size_in" integer,
	"suction_point_note" text DEFAULT '' NOT NULL,
	"footprint" jsonb,
	"owner_name" text DEFAULT '' NOT NULL,
	"mailing_address" text DEFAULT '' NOT NULL,
	"do_not_contact" boolean DEFAULT false NOT NULL,
	"outcome" text DEFAULT 'not_visited' NOT NULL,
	"last_vacuum_pa" double precision,
	"last_post_bq_m3" double precision,
	"rework_flag" boolean DEFAULT false NOT NULL,
	"sampled" boolean DEFAULT false NOT NULL,
	"failed" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "homes_year_built" CHECK ("homes"."year_built" is null or "homes"."year_built" between 1800 and 2100),
	CONSTRAINT "homes_foundation" CHECK (foundation is null or foundation in ('slab', 'basement', 'crawlspace', 'mixed')),
	CONSTRAINT "homes_passive_system" CHECK (passive_system in ('yes', 'no', 'unknown')),
	CONSTRAINT "homes_pipe_size" CHECK (pipe_size_in is null or pipe_size_in in (3, 4)),
	CONSTRAINT "homes_outcome" CHECK (outcome in ('not_visited', 'awaiting_test', 'below_action_level', 'needs_rework', 'reworked_below', 'declined')),
	CONSTRAINT "homes_location_in_range" CHECK (ST_X(location) between -180 and 180 and ST_Y(location) between -90 and 90)
);
--> statement-breakpoint
CREATE TABLE "radon_tests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"home_id" uuid NOT NULL,
	"visit_id" uuid,
	"kind" text NOT NULL,
	"device" text NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"ended_at" timestamp with time zone NOT NULL,
	"result_bq_m3" double precision NOT NULL,
	"side_by_side_group" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "radon_tests_kind" CHECK (kind in ('pre', 'post')),
	CONSTRAINT "radon_tests_device" CHECK (device in ('continuous_monitor', 'charcoal', 'alpha_track', 'electret')),
	CONSTRAINT "radon_tests_ends_after_start" CHECK ("radon_tests"."ended_at" > "radon_tests"."started_at"),
	CONSTRAINT "radon_tests_result_non_negative" CHECK ("radon_tests"."result_bq_m3" >= 0)
);
--> statement-breakpoint
CREATE TABLE "session" (
	"sid" varchar PRIMARY KEY NOT NULL,
	"sess" json NOT NULL,
	"expire" timestamp (6) NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"role" text NOT NULL,
	"password_hash" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_role" CHECK (role in ('admin', 'manager', 'estimator', 'technician', 'sales'))
);
--> statement-breakpoint
CREATE TABLE "visits" (
	"id" uuid PRIMARY KEY NOT NULL,
	"company_id" uuid NOT NULL,
	"home_id" uuid NOT NULL,
	"technician_id" uuid,
	"visited_on" date NOT NULL,
	"status" text NOT NULL,
	"fan_id" uuid,
	"fan_location" text DEFAULT '' NOT NULL,
	"fan_activated_at" timestamp with time zone,
	"vacuum_pa" double precision,
	"later_vacuum_pa" double precision,
	"pipe_size_in" integer,
	"pipe_length_ft" double precision,
	"elbows" integer,
	"pipe_entry" text DEFAULT '' NOT NULL,
	"sub_slab_material" text DEFAULT 'unknown' NOT NULL,
	"pressure_field" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"rework_needed" boolean DEFAULT false NOT NULL,
	"rework_done" boolean DEFAULT false NOT NULL,
	"rework_reasons" text[] DEFAULT '{}'::text[] NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "visits_status" CHECK (status in ('completed', 'declined', 'no_access')),
	CONSTRAINT "visits_vacuum_non_negative" CHECK ("visits"."vacuum_pa" is null or "visits"."vacuum_pa" >= 0),
	CONSTRAINT "visits_later_vacuum_non_negative" CHECK ("visits"."later_vacuum_pa" is null or "visits"."later_vacuum_pa" >= 0),
	CONSTRAINT "visits_pipe_size" CHECK (pipe_size_in is null or pipe_size_in in (3, 4)),
	CONSTRAINT "visits_pipe_length_non_negative" CHECK ("visits"."pipe_length_ft" is null or "visits"."pipe_length_ft" >= 0),
	CONSTRAINT "visits_elbows_non_negative" CHECK ("visits"."elbows" is null or "visits"."elbows" >= 0),
	CONSTRAINT "visits_sub_slab" CHECK (sub_slab_material in ('clean_gravel', 'mixed', 'none', 'unknown'))
);
--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_home_id_homes_id_fk" FOREIGN KEY ("home_id") REFERENCES "public"."homes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_radon_test_id_radon_tests_id_fk" FOREIGN KEY ("radon_test_id") REFERENCES "public"."radon_tests"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "builders" ADD CONSTRAINT "builders_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "communities" ADD CONSTRAINT "communities_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "community_builders" ADD CONSTRAINT "community_builders_community_id_communities_id_fk" FOREIGN KEY ("community_id") REFERENCES "public"."communities"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "community_builders" ADD CONSTRAINT "community_builders_builder_id_builders_id_fk" FOREIGN KEY ("builder_id") REFERENCES "public"."builders"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fans" ADD CONSTRAINT "fans_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "homes" ADD CONSTRAINT "homes_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "homes" ADD CONSTRAINT "homes_community_id_communities_id_fk" FOREIGN KEY ("community_id") REFERENCES "public"."communities"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "homes" ADD CONSTRAINT "homes_builder_id_builders_id_fk" FOREIGN KEY ("builder_id") REFERENCES "public"."builders"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "radon_tests" ADD CONSTRAINT "radon_tests_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "radon_tests" ADD CONSTRAINT "radon_tests_home_id_homes_id_fk" FOREIGN KEY ("home_id") REFERENCES "public"."homes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "radon_tests" ADD CONSTRAINT "radon_tests_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "users" ADD CONSTRAINT "users_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_home_id_homes_id_fk" FOREIGN KEY ("home_id") REFERENCES "public"."homes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_technician_id_users_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_fan_id_fans_id_fk" FOREIGN KEY ("fan_id") REFERENCES "public"."fans"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "attachments_company_home_idx" ON "attachments" USING btree ("company_id","home_id");--> statement-breakpoint
CREATE UNIQUE INDEX "builders_company_name_unique" ON "builders" USING btree ("company_id",lower("name"));--> statement-breakpoint
CREATE UNIQUE INDEX "communities_company_name_unique" ON "communities" USING btree ("company_id",lower("name"));--> statement-breakpoint
CREATE INDEX "communities_boundary_gist" ON "communities" USING gist ("boundary");--> statement-breakpoint
CREATE UNIQUE INDEX "fans_company_name_unique" ON "fans" USING btree ("company_id",lower("name"));--> statement-breakpoint
CREATE UNIQUE INDEX "homes_company_address_unique" ON "homes" USING btree ("company_id","address_key");--> statement-breakpoint
CREATE INDEX "homes_location_gist" ON "homes" USING gist ("location");--> statement-breakpoint
CREATE INDEX "homes_company_community_idx" ON "homes" USING btree ("company_id","community_id");--> statement-breakpoint
CREATE INDEX "homes_company_builder_year_idx" ON "homes" USING btree ("company_id","builder_id","year_built");--> statement-breakpoint
CREATE INDEX "homes_company_outcome_idx" ON "homes" USING btree ("company_id","outcome");--> statement-breakpoint
CREATE INDEX "radon_tests_company_home_idx" ON "radon_tests" USING btree ("company_id","home_id");--> statement-breakpoint
CREATE INDEX "IDX_session_expire" ON "session" USING btree ("expire");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_unique" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE INDEX "users_company_idx" ON "users" USING btree ("company_id");--> statement-breakpoint
CREATE INDEX "visits_company_home_idx" ON "visits" USING btree ("company_id","home_id");