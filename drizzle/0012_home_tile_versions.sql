CREATE TABLE "home_tile_versions" (
	"company_id" uuid NOT NULL,
	"z" integer NOT NULL,
	"x" integer NOT NULL,
	"y" integer NOT NULL,
	"version" bigint NOT NULL,
	CONSTRAINT "home_tile_versions_company_id_z_x_y_pk" PRIMARY KEY("company_id","z","x","y")
);
--> statement-breakpoint
ALTER TABLE "home_tile_versions" ADD CONSTRAINT "home_tile_versions_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE SEQUENCE home_tile_version_seq;
--> statement-breakpoint
-- The homes tiles (zooms 11 to 16) that draw these points (a company, merc_x and merc_y per changed
-- home, before and after) get a new version: the tile holding the point, and the neighbour whose
-- 64-unit margin shows it (a metre more, for rounding). A statement that changes more than 2,000 homes
-- bumps the company's homes_version instead, which every cached tile of the company is keyed on.
CREATE FUNCTION bump_home_tiles_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  v bigint;
BEGIN
  IF coalesce(cardinality(company_ids), 0) = 0 THEN
    RETURN;
  END IF;
  IF cardinality(company_ids) > 2000 THEN
    UPDATE companies SET homes_version = homes_version + 1 WHERE id IN (SELECT DISTINCT c FROM unnest(company_ids) AS c);
    RETURN;
  END IF;
  v := nextval('home_tile_version_seq');
  INSERT INTO home_tile_versions (company_id, z, x, y, version)
  SELECT DISTINCT p.company_id, z.z, tx.t, ty.t, v
  FROM unnest(company_ids, xs, ys) AS p(company_id, x, y),
       generate_series(11, 16) AS z(z),
       LATERAL (SELECT 40075016.685578488 / 2 ^ z.z AS size) s,
       LATERAL (SELECT floor((p.x + 20037508.342789244 + d.d * (s.size / 64 + 1)) / s.size)::int AS t FROM (VALUES (-1), (1)) AS d(d)) tx,
       LATERAL (SELECT floor((20037508.342789244 - p.y + d.d * (s.size / 64 + 1)) / s.size)::int AS t FROM (VALUES (-1), (1)) AS d(d)) ty
  WHERE p.company_id IS NOT NULL AND p.x IS NOT NULL AND p.y IS NOT NULL
  ON CONFLICT (company_id, z, x, y) DO UPDATE SET version = excluded.version;
END $$;
--> statement-breakpoint
-- One trigger for what the map draws, replacing the homes triggers of 0005 (every change to a home made
-- every cached tile of the company stale) and of 0009 (overview cells): from the homes a statement
-- changed (before and after), the tiles that draw them get new versions and their overview cells are
-- counted again, unless the transaction refreshes the cells itself (tractwise.home_cells_deferred, see
-- 0010). An update counts when it changes what a tile draws or filters on; a note or an owner's name does not.
CREATE FUNCTION homes_drawn_changed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  company_ids uuid[];
  xs double precision[];
  ys double precision[];
BEGIN
  IF TG_OP = 'INSERT' THEN
    SELECT array_agg(company_id), array_agg(merc_x), array_agg(merc_y) INTO company_ids, xs, ys FROM new_rows;
  ELSIF TG_OP = 'DELETE' THEN
    SELECT array_agg(company_id), array_agg(merc_x), array_agg(merc_y) INTO company_ids, xs, ys FROM old_rows;
  ELSE
    SELECT array_agg(side.company_id), array_agg(side.x), array_agg(side.y) INTO company_ids, xs, ys
    FROM old_rows o JOIN new_rows n ON n.id = o.id,
    LATERAL (VALUES (o.company_id, o.merc_x, o.merc_y), (n.company_id, n.merc_x, n.merc_y)) AS side(company_id, x, y)
    WHERE (o.company_id, o.merc_x, o.merc_y, o.outcome, o.year_built, o.last_vacuum_pa, o.last_post_bq_m3, o.rework_flag, o.builder_id, o.community_id)
          IS DISTINCT FROM (n.company_id, n.merc_x, n.merc_y, n.outcome, n.year_built, n.last_vacuum_pa, n.last_post_bq_m3, n.rework_flag, n.builder_id, n.community_id);
  END IF;
  IF company_ids IS NULL THEN
    RETURN NULL;
  END IF;
  PERFORM bump_home_tiles_at(company_ids, xs, ys);
  IF current_setting('tractwise.home_cells_deferred', true) IS DISTINCT FROM 'on' THEN
    PERFORM refresh_home_cells_at(company_ids, xs, ys);
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
DROP TRIGGER homes_version_insert ON homes;
--> statement-breakpoint
DROP TRIGGER homes_version_update ON homes;
--> statement-breakpoint
DROP TRIGGER homes_version_delete ON homes;
--> statement-breakpoint
DROP TRIGGER homes_cells_insert ON homes;
--> statement-breakpoint
DROP TRIGGER homes_cells_update ON homes;
--> statement-breakpoint
DROP TRIGGER homes_cells_delete ON homes;
--> statement-breakpoint
DROP FUNCTION refresh_home_cells();
--> statement-breakpoint
CREATE TRIGGER homes_drawn_insert AFTER INSERT ON homes REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION homes_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER homes_drawn_update AFTER UPDATE ON homes REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION homes_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER homes_drawn_delete AFTER DELETE ON homes REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION homes_drawn_changed();
