ALTER TABLE "homes" ADD COLUMN "ref" bigint NOT NULL GENERATED ALWAYS AS IDENTITY (sequence name "homes_ref_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1);--> statement-breakpoint
ALTER TABLE "homes" ADD COLUMN "merc_x" double precision GENERATED ALWAYS AS (ST_X(ST_Transform(location, 3857))) STORED;--> statement-breakpoint
ALTER TABLE "homes" ADD COLUMN "merc_y" double precision GENERATED ALWAYS AS (ST_Y(ST_Transform(location, 3857))) STORED;--> statement-breakpoint
CREATE UNIQUE INDEX "homes_ref_unique" ON "homes" USING btree ("ref");--> statement-breakpoint
CREATE INDEX "homes_company_merc_idx" ON "homes" USING btree ("company_id","merc_x","merc_y");