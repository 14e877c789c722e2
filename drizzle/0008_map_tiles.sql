CREATE TABLE "home_cells" (
	"company_id" uuid NOT NULL,
	"z" integer NOT NULL,
	"cx" integer NOT NULL,
	"cy" integer NOT NULL,
	"homes" integer NOT NULL,
	"outcome_rank" integer NOT NULL,
	"year_min" integer,
	"vacuum_sum_pa" double precision,
	"vacuum_count" integer NOT NULL,
	"post_max_bq_m3" double precision,
	"rework" boolean NOT NULL,
	CONSTRAINT "home_cells_company_id_z_cx_cy_pk" PRIMARY KEY("company_id","z","cx","cy")
);
--> statement-breakpoint
CREATE TABLE "home_tile_versions" (
	"company_id" uuid NOT NULL,
	"z" integer NOT NULL,
	"x" integer NOT NULL,
	"y" integer NOT NULL,
	"version" bigint NOT NULL,
	CONSTRAINT "home_tile_versions_company_id_z_x_y_pk" PRIMARY KEY("company_id","z","x","y")
);
--> statement-breakpoint
DROP INDEX "homes_location_gist";--> statement-breakpoint
ALTER TABLE "homes" ADD COLUMN "ref" bigint NOT NULL GENERATED ALWAYS AS IDENTITY (sequence name "homes_ref_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1);--> statement-breakpoint
ALTER TABLE "homes" ADD COLUMN "merc_x" double precision GENERATED ALWAYS AS (ST_X(location) * 20037508.342789244 / 180) STORED;--> statement-breakpoint
ALTER TABLE "homes" ADD COLUMN "merc_y" double precision GENERATED ALWAYS AS (ln(tan(radians(90 + least(greatest(ST_Y(location), -85.0511287798066), 85.0511287798066)) / 2)) * 6378137) STORED;--> statement-breakpoint
ALTER TABLE "home_cells" ADD CONSTRAINT "home_cells_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "home_tile_versions" ADD CONSTRAINT "home_tile_versions_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "homes_ref_unique" ON "homes" USING btree ("ref");--> statement-breakpoint
-- Homes tiles read every home in a tile's extent: a covering index in (company, x, y) order with what
-- a tile draws and filters on lets PostgreSQL answer from the index alone once the table is vacuumed.
-- merc_x and merc_y are the spherical Mercator formulas, as ST_Transform(location, 3857) gives them to
-- within nanometres at a quarter of the cost. The GiST index on location had no reader left: dropped.
CREATE INDEX "homes_tile_idx" ON "homes" ("company_id", "merc_x", "merc_y")
  INCLUDE ("ref", "id", "outcome", "year_built", "last_vacuum_pa", "last_post_bq_m3", "rework_flag", "builder_id", "community_id");
--> statement-breakpoint
CREATE SEQUENCE home_tile_version_seq;
--> statement-breakpoint
-- The column (of v = merc_x) or row (of v = -merc_y) of a 64-unit cell of the tile grid at zoom z:
-- a tile is 4096 units wide, so 64 cells per tile side, counted from the west and north edges of the
-- Web Mercator square (half width 20037508.342789244 m). The homes tiles use the same function.
CREATE FUNCTION merc_cell(v double precision, z integer) RETURNS integer
LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $$
  SELECT floor((v + 20037508.342789244) / (40075016.685578488 / 2 ^ (z + 6)))::integer
$$;
--> statement-breakpoint
-- How much an outcome needs attention, 1 = most: the order of OUTCOME_PRIORITY in home-tiles.repository.ts.
CREATE FUNCTION outcome_attention_rank(outcome text) RETURNS integer
LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
  SELECT CASE outcome WHEN 'needs_rework' THEN 1 WHEN 'awaiting_test' THEN 2 WHEN 'reworked_below' THEN 3
    WHEN 'below_action_level' THEN 4 WHEN 'declined' THEN 5 WHEN 'not_visited' THEN 6 END
$$;
--> statement-breakpoint
-- Zoom 13 cells counted from the homes; each coarser zoom from the one below it (a cell is the four
-- below it: column and row halved), instead of grouping every home again for each zoom.
CREATE FUNCTION rebuild_home_cells(company uuid) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM home_cells WHERE company_id = company;
  INSERT INTO home_cells (company_id, z, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework)
  SELECT company, 13, merc_cell(h.merc_x, 13), merc_cell(-h.merc_y, 13), count(*)::int, min(outcome_attention_rank(h.outcome)),
         min(h.year_built), sum(h.last_vacuum_pa), count(h.last_vacuum_pa)::int, max(h.last_post_bq_m3), bool_or(h.rework_flag)
  FROM homes h
  WHERE h.company_id = company
  GROUP BY 3, 4
  ORDER BY 3, 4; -- stored in key order: a tile's cells sit on a few pages
  FOR zoom IN REVERSE 12..11 LOOP
    INSERT INTO home_cells (company_id, z, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework)
    SELECT company, zoom, c.cx >> 1, c.cy >> 1, sum(c.homes)::int, min(c.outcome_rank), min(c.year_min), sum(c.vacuum_sum_pa),
           sum(c.vacuum_count)::int, max(c.post_max_bq_m3), bool_or(c.rework)
    FROM home_cells c
    WHERE c.company_id = company AND c.z = zoom + 1
    GROUP BY 3, 4
    ORDER BY 3, 4;
  END LOOP;
END $$;
--> statement-breakpoint
-- Cells are refreshed by the area a statement touched, never by regrouping all of a company's homes:
-- the finest zoom (13) from the homes in the touched cells (each cell by index when there are few, the
-- cells' bounding box grouped when there are many), each coarser zoom from the four cells below it.
CREATE FUNCTION refresh_home_cells_at(companies uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  t_company uuid[];
  t_cx integer[];
  t_cy integer[];
  few boolean;
  size constant double precision := 40075016.685578488 / 2 ^ (13 + 6); -- a zoom-13 cell, in metres
BEGIN
  SELECT array_agg(company_id), array_agg(cx), array_agg(cy) INTO t_company, t_cx, t_cy FROM (
    SELECT DISTINCT p.company_id, merc_cell(p.x, 13) AS cx, merc_cell(-p.y, 13) AS cy
    FROM unnest(companies, xs, ys) AS p(company_id, x, y)
    WHERE p.company_id IS NOT NULL AND p.x IS NOT NULL AND p.y IS NOT NULL
  ) s;
  IF t_company IS NULL THEN
    RETURN;
  END IF;
  -- One writer of a company's cells at a time, until it commits: each count below is a statement of its
  -- own, so under READ COMMITTED it sees what the writer before committed. Without this, two visits in
  -- one cell could each count the other's home as it was, and the last to commit would keep its count.
  PERFORM pg_advisory_xact_lock(7001, hashtext(c::text)) FROM (SELECT DISTINCT unnest(t_company) AS c ORDER BY 1) s;
  FOR zoom IN REVERSE 13..11 LOOP
    few := cardinality(t_company) <= 2000;
    WITH touched AS (
      SELECT * FROM unnest(t_company, t_cx, t_cy) AS t(company_id, cx, cy)
    ),
    box AS (
      SELECT company_id, min(cx) AS cx0, max(cx) AS cx1, min(cy) AS cy0, max(cy) AS cy1 FROM touched GROUP BY 1
    ),
    counted AS (
      -- Zoom 13, a few cells: each from the homes in it, found by index.
      SELECT t.company_id, t.cx, t.cy, a.homes, a.outcome_rank, a.year_min, a.vacuum_sum_pa, a.vacuum_count, a.post_max_bq_m3, a.rework
      FROM touched t, LATERAL (
        SELECT count(*)::int AS homes, min(outcome_attention_rank(h.outcome)) AS outcome_rank, min(h.year_built) AS year_min,
               sum(h.last_vacuum_pa) AS vacuum_sum_pa, count(h.last_vacuum_pa)::int AS vacuum_count,
               max(h.last_post_bq_m3) AS post_max_bq_m3, coalesce(bool_or(h.rework_flag), false) AS rework
        FROM homes h
        WHERE h.company_id = t.company_id
          AND h.merc_x BETWEEN -20037508.342789244 + t.cx * size - 1 AND -20037508.342789244 + (t.cx + 1) * size + 1
          AND h.merc_y BETWEEN 20037508.342789244 - (t.cy + 1) * size - 1 AND 20037508.342789244 - t.cy * size + 1
          AND merc_cell(h.merc_x, 13) = t.cx AND merc_cell(-h.merc_y, 13) = t.cy
      ) a
      WHERE zoom = 13 AND few
      UNION ALL
      -- Zoom 13, many cells: the homes in the cells' bounding box, grouped by cell.
      SELECT h.company_id, merc_cell(h.merc_x, 13), merc_cell(-h.merc_y, 13), count(*)::int, min(outcome_attention_rank(h.outcome)),
             min(h.year_built), sum(h.last_vacuum_pa), count(h.last_vacuum_pa)::int, max(h.last_post_bq_m3), bool_or(h.rework_flag)
      FROM box b JOIN homes h ON h.company_id = b.company_id
        AND h.merc_x BETWEEN -20037508.342789244 + b.cx0 * size - 1 AND -20037508.342789244 + (b.cx1 + 1) * size + 1
        AND h.merc_y BETWEEN 20037508.342789244 - (b.cy1 + 1) * size - 1 AND 20037508.342789244 - b.cy0 * size + 1
      WHERE zoom = 13 AND NOT few
      GROUP BY 1, 2, 3
      UNION ALL
      -- Coarser zooms: a cell is the four cells below it (column and row halved).
      SELECT c.company_id, c.cx >> 1, c.cy >> 1, sum(c.homes)::int, min(c.outcome_rank), min(c.year_min), sum(c.vacuum_sum_pa),
             sum(c.vacuum_count)::int, max(c.post_max_bq_m3), bool_or(c.rework)
      FROM box b JOIN home_cells c ON c.company_id = b.company_id AND c.z = zoom + 1
        AND c.cx BETWEEN b.cx0 * 2 AND b.cx1 * 2 + 1 AND c.cy BETWEEN b.cy0 * 2 AND b.cy1 * 2 + 1
      WHERE zoom < 13
      GROUP BY 1, 2, 3
    ),
    fresh AS (
      SELECT t.company_id, t.cx, t.cy, coalesce(c.homes, 0) AS homes, c.outcome_rank, c.year_min, c.vacuum_sum_pa,
             c.vacuum_count, c.post_max_bq_m3, c.rework
      FROM touched t LEFT JOIN counted c ON c.company_id = t.company_id AND c.cx = t.cx AND c.cy = t.cy
    ),
    emptied AS (
      DELETE FROM home_cells k USING fresh f
      WHERE f.homes = 0 AND k.company_id = f.company_id AND k.z = zoom AND k.cx = f.cx AND k.cy = f.cy
    )
    INSERT INTO home_cells (company_id, z, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework)
    SELECT company_id, zoom, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework
    FROM fresh WHERE homes > 0
    ORDER BY company_id, cx, cy
    ON CONFLICT (company_id, z, cx, cy) DO UPDATE SET
      homes = excluded.homes, outcome_rank = excluded.outcome_rank, year_min = excluded.year_min,
      vacuum_sum_pa = excluded.vacuum_sum_pa, vacuum_count = excluded.vacuum_count,
      post_max_bq_m3 = excluded.post_max_bq_m3, rework = excluded.rework;
    -- The next zoom refreshes the cells holding these.
    SELECT array_agg(company_id), array_agg(cx), array_agg(cy) INTO t_company, t_cx, t_cy FROM (
      SELECT DISTINCT t.company_id, t.cx >> 1 AS cx, t.cy >> 1 AS cy FROM unnest(t_company, t_cx, t_cy) AS t(company_id, cx, cy)
    ) s;
  END LOOP;
END $$;
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
    AND EXISTS (SELECT 1 FROM companies c WHERE c.id = p.company_id) -- not for a company being deleted
  ORDER BY 1, 2, 3, 4 -- rows locked in one order by every writer: no deadlock between two
  ON CONFLICT (company_id, z, x, y) DO UPDATE SET version = excluded.version;
END $$;
--> statement-breakpoint
-- One trigger for what the map draws, replacing the homes triggers of 0005 (every change to a home made
-- every cached tile of the company stale): from the homes a statement changed (before and after), the
-- tiles that draw them get new versions and their overview cells are counted again. An import writes
-- its homes in statements of 5,000 rows; its transaction sets tractwise.home_cells_deferred = 'on'
-- (set_config, local) and refreshes its homes' cells itself, once, before it commits (imports.repository.ts).
-- An update counts when it changes what a tile draws or filters on; a note or an owner's name does not.
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
CREATE TRIGGER homes_drawn_insert AFTER INSERT ON homes REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION homes_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER homes_drawn_update AFTER UPDATE ON homes REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION homes_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER homes_drawn_delete AFTER DELETE ON homes REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION homes_drawn_changed();
--> statement-breakpoint
SELECT rebuild_home_cells(id) FROM companies;
