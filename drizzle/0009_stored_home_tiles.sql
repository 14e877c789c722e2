CREATE TABLE "home_tiles" (
	"company_id" uuid NOT NULL,
	"z" integer NOT NULL,
	"x" integer NOT NULL,
	"y" integer NOT NULL,
	"mvt" "bytea" NOT NULL,
	CONSTRAINT "home_tiles_company_id_z_x_y_pk" PRIMARY KEY("company_id","z","x","y")
);
--> statement-breakpoint
ALTER TABLE "home_tiles" ADD CONSTRAINT "home_tiles_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- The homes in the latest sampling plan of each of a company's communities: not yet visited, they are
-- "planned" (the home panel says so, the map draws them with the planned symbol). homes.repository.ts
-- and the homes tiles both read this one definition.
CREATE FUNCTION planned_home_ids(company uuid) RETURNS TABLE (home_id uuid) LANGUAGE sql STABLE AS $$
  SELECT home_id FROM sampling_plan_homes WHERE plan_id IN (
    SELECT DISTINCT ON (community_id) id FROM sampling_plans
    WHERE company_id = company ORDER BY community_id, created_at DESC, id DESC)
$$;
--> statement-breakpoint
-- The outcome of attention rank n: the inverse of outcome_attention_rank() (migration 0008).
CREATE FUNCTION outcome_of_attention_rank(n integer) RETURNS text
LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
  SELECT (array['needs_rework', 'awaiting_test', 'reworked_below', 'below_action_level', 'declined', 'not_visited'])[n]
$$;
--> statement-breakpoint
-- Whether a home passes the map's filters (a null filter passes every home).
CREATE FUNCTION home_tile_filter(builder_id uuid, community_id uuid, year_built integer, outcome text,
  f_builder uuid, f_community uuid, f_year_from integer, f_year_to integer, f_outcomes text[]) RETURNS boolean
LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
  SELECT (f_builder IS NULL OR builder_id = f_builder) AND (f_community IS NULL OR community_id = f_community)
    AND (f_year_from IS NULL OR year_built >= f_year_from) AND (f_year_to IS NULL OR year_built <= f_year_to)
    AND (f_outcomes IS NULL OR outcome = ANY (f_outcomes))
$$;
--> statement-breakpoint
-- One homes tile (layer "homes"), as ST_AsMVT encodes it: the one definition of what the map draws,
-- used for the tiles stored in home_tiles and for those built on request (filtered, or deeper than 14).
--
-- A tile is 4096 units wide; the homes within 64 units around it are kept, so marks on an edge are
-- drawn whole. Homes keep their Web Mercator metres (merc_x, merc_y), so a tile is a range scan of the
-- (company, merc_x, merc_y) index and arithmetic to the grid.
--
-- From zoom 14 up (HOMES_DETAIL_MIN_ZOOM) every home is a feature, with homes.ref as its id so a tap
-- can open it. Below, one feature per 64-unit cell (8 px), with the number of homes and the outcome most
-- in need of attention (OUTCOME_PRIORITY), read from home_cells, or counted from the matching homes when
-- the map is filtered (or live_cells is asked for, by tests).
--
-- Values are rounded half up in float8 (they are never negative): numeric rounding costs about a quarter
-- of a dense tile, and float8 round() breaks ties to even (3.85 would show as 3.8). 249.0889 Pa per inch
-- of water and 37 Bq/m³ per pCi/L are IN_WC_TO_PA and PCI_PER_L_TO_BQ_M3 of shared/domain/units.ts. A
-- property without a value is left out (MVT spec 2.1 §4.2): rework and planned appear only when true.
CREATE FUNCTION homes_tile_mvt(company uuid, tz integer, tx integer, ty integer,
  f_builder uuid DEFAULT NULL, f_community uuid DEFAULT NULL, f_year_from integer DEFAULT NULL, f_year_to integer DEFAULT NULL,
  f_outcomes text[] DEFAULT NULL, live_cells boolean DEFAULT false) RETURNS bytea
LANGUAGE plpgsql STABLE AS $$
DECLARE
  envelope constant geometry := ST_TileEnvelope(tz, tx, ty);
  x0 constant double precision := ST_XMin(envelope);
  y0 constant double precision := ST_YMax(envelope);
  tile_unit constant double precision := (ST_XMax(envelope) - ST_XMin(envelope)) / 4096;
  counted constant boolean := live_cells OR f_builder IS NOT NULL OR f_community IS NOT NULL OR f_year_from IS NOT NULL
    OR f_year_to IS NOT NULL OR f_outcomes IS NOT NULL;
  -- Found once, from the plans: a few homes per community. Looked up by id, whatever the statistics
  -- say (an import's transaction asks for its tiles before its 100,000 homes have any).
  planned constant uuid[] := array(SELECT p.home_id FROM planned_home_ids(company) p);
  mvt bytea;
BEGIN
  IF tz >= 14 THEN
    SELECT ST_AsMVT(t.*, 'homes', 4096, 'geom', 'ref') INTO mvt FROM (
      SELECT ST_MakePoint(floor((h.merc_x - x0) / tile_unit + 0.5), floor((y0 - h.merc_y) / tile_unit + 0.5)) AS geom,
        h.ref, h.outcome, h.year_built AS year,
        floor(h.last_vacuum_pa / 249.0889 * 100 + 0.5) / 100 AS vacuum_in_wc,
        floor(h.last_post_bq_m3 / 37 * 10 + 0.5) / 10 AS post_pci_l,
        nullif(h.rework_flag, false) AS rework,
        nullif(h.outcome = 'not_visited' AND h.id IN (SELECT unnest(planned)), false) AS planned
      FROM homes h
      WHERE h.company_id = company
        AND home_tile_filter(h.builder_id, h.community_id, h.year_built, h.outcome, f_builder, f_community, f_year_from, f_year_to, f_outcomes)
        AND h.merc_x >= x0 - 64 * tile_unit AND h.merc_x <= x0 + 4160 * tile_unit
        AND h.merc_y <= y0 + 64 * tile_unit AND h.merc_y >= y0 - 4160 * tile_unit
    ) t;
    RETURN mvt;
  END IF;
  -- Cells are numbered over the whole grid by merc_cell() (64 per tile side) and drawn at their centre;
  -- the ring of cells around the tile is its margin.
  WITH planned_cells AS MATERIALIZED (
    SELECT DISTINCT merc_cell(h.merc_x, tz) AS cx, merc_cell(-h.merc_y, tz) AS cy
    FROM homes h
    WHERE h.id = ANY (planned) AND h.company_id = company AND h.outcome = 'not_visited'
      AND home_tile_filter(h.builder_id, h.community_id, h.year_built, h.outcome, f_builder, f_community, f_year_from, f_year_to, f_outcomes)
  ),
  cells AS (
    SELECT c.cx, c.cy, c.homes, c.outcome_rank, c.year_min, c.vacuum_sum_pa, c.vacuum_count, c.post_max_bq_m3, c.rework
    FROM home_cells c
    WHERE NOT counted AND c.company_id = company AND c.z = tz
      AND c.cx BETWEEN tx * 64 - 1 AND tx * 64 + 64 AND c.cy BETWEEN ty * 64 - 1 AND ty * 64 + 64
    UNION ALL
    SELECT merc_cell(h.merc_x, tz), merc_cell(-h.merc_y, tz), count(*)::int, min(outcome_attention_rank(h.outcome)),
      min(h.year_built), sum(h.last_vacuum_pa), count(h.last_vacuum_pa)::int, max(h.last_post_bq_m3), bool_or(h.rework_flag)
    FROM homes h
    WHERE counted AND h.company_id = company
      AND home_tile_filter(h.builder_id, h.community_id, h.year_built, h.outcome, f_builder, f_community, f_year_from, f_year_to, f_outcomes)
      AND h.merc_x >= x0 - 64 * tile_unit AND h.merc_x <= x0 + 4160 * tile_unit
      AND h.merc_y <= y0 + 64 * tile_unit AND h.merc_y >= y0 - 4160 * tile_unit
    GROUP BY 1, 2
  )
  SELECT ST_AsMVT(t.*, 'homes', 4096, 'geom') INTO mvt FROM (
    SELECT ST_MakePoint((c.cx - tx * 64) * 64 + 32, (c.cy - ty * 64) * 64 + 32) AS geom,
      c.homes,
      outcome_of_attention_rank(c.outcome_rank) AS outcome,
      c.year_min AS year,
      floor(c.vacuum_sum_pa / nullif(c.vacuum_count, 0) / 249.0889 * 100 + 0.5) / 100 AS vacuum_in_wc,
      floor(c.post_max_bq_m3 / 37 * 10 + 0.5) / 10 AS post_pci_l,
      nullif(c.rework, false) AS rework,
      nullif(p.cx IS NOT NULL, false) AS planned
    FROM cells c LEFT JOIN planned_cells p ON p.cx = c.cx AND p.cy = c.cy
    WHERE c.cx BETWEEN tx * 64 - 1 AND tx * 64 + 64 AND c.cy BETWEEN ty * 64 - 1 AND ty * 64 + 64
  ) t;
  RETURN mvt;
END $$;
--> statement-breakpoint
-- The unfiltered tiles of zooms 11 to 14 that draw these points (a company, merc_x and merc_y per home,
-- before and after a change) encoded again into home_tiles: the tile holding the point and any
-- neighbour whose 64-unit margin shows it (as bump_home_tiles_at finds them). Zooms 11 to 13 read
-- home_cells, so their cells are refreshed first (refresh_home_map_at). More than 2,000 points are
-- first gathered on a grid of a sixteenth of a zoom-14 tile (153 m), with the margin widened by as
-- much: a tile more may be encoded, none is missed.
CREATE FUNCTION store_home_tiles_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  grid constant double precision := CASE WHEN coalesce(cardinality(company_ids), 0) > 2000 THEN 40075016.685578488 / 2 ^ 14 / 16 ELSE 0 END;
BEGIN
  IF coalesce(cardinality(company_ids), 0) = 0 THEN
    RETURN;
  END IF;
  -- One writer of a company's map at a time, until it commits (as in refresh_home_cells_at): each tile
  -- is encoded by a statement of its own, so under READ COMMITTED it sees what the writer before committed.
  PERFORM pg_advisory_xact_lock(7001, hashtext(c::text)) FROM (SELECT DISTINCT unnest(company_ids) AS c ORDER BY 1) s WHERE c IS NOT NULL;
  WITH points AS (
    SELECT DISTINCT p.company_id,
      CASE WHEN grid > 0 THEN round(p.x / grid) * grid ELSE p.x END AS x,
      CASE WHEN grid > 0 THEN round(p.y / grid) * grid ELSE p.y END AS y
    FROM unnest(company_ids, xs, ys) AS p(company_id, x, y)
    WHERE p.company_id IS NOT NULL AND p.x IS NOT NULL AND p.y IS NOT NULL
      AND EXISTS (SELECT 1 FROM companies c WHERE c.id = p.company_id) -- not for a company being deleted
  ),
  tiles AS (
    SELECT DISTINCT p.company_id, z.z, tx.t AS x, ty.t AS y
    FROM points p,
         generate_series(11, 14) AS z(z),
         LATERAL (SELECT 40075016.685578488 / 2 ^ z.z AS size) s,
         LATERAL (SELECT floor((p.x + 20037508.342789244 + d.d * (s.size / 64 + 1 + grid)) / s.size)::int AS t FROM (VALUES (-1), (1)) AS d(d)) tx,
         LATERAL (SELECT floor((20037508.342789244 - p.y + d.d * (s.size / 64 + 1 + grid)) / s.size)::int AS t FROM (VALUES (-1), (1)) AS d(d)) ty
  ),
  encoded AS (
    SELECT t.company_id, t.z, t.x, t.y, homes_tile_mvt(t.company_id, t.z, t.x, t.y) AS mvt FROM tiles t
  ),
  emptied AS (
    DELETE FROM home_tiles k USING encoded e
    WHERE length(e.mvt) = 0 AND k.company_id = e.company_id AND k.z = e.z AND k.x = e.x AND k.y = e.y
  )
  INSERT INTO home_tiles (company_id, z, x, y, mvt)
  SELECT company_id, z, x, y, mvt FROM encoded WHERE length(mvt) > 0
  ORDER BY 1, 2, 3, 4 -- rows locked in one order by every writer
  ON CONFLICT (company_id, z, x, y) DO UPDATE SET mvt = excluded.mvt;
END $$;
--> statement-breakpoint
-- What the map shows of these points, made current: their overview cells counted again, then the
-- stored tiles that draw them encoded again. The homes trigger calls this after each statement, and an
-- import that defers it (tractwise.home_cells_deferred) calls it once before it commits.
CREATE FUNCTION refresh_home_map_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  PERFORM refresh_home_cells_at(company_ids, xs, ys);
  PERFORM store_home_tiles_at(company_ids, xs, ys);
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION homes_drawn_changed() RETURNS trigger LANGUAGE plpgsql AS $$
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
    PERFORM refresh_home_map_at(company_ids, xs, ys);
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
-- A sampling plan decides which homes are drawn "planned": a new (or removed) plan of a community
-- changes the homes of that community's plans, and a plan's homes change with their rows.
CREATE FUNCTION plans_drawn_changed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  company_ids uuid[];
  xs double precision[];
  ys double precision[];
BEGIN
  IF TG_TABLE_NAME = 'sampling_plans' THEN
    SELECT array_agg(h.company_id), array_agg(h.merc_x), array_agg(h.merc_y) INTO company_ids, xs, ys
    FROM homes h
    WHERE h.id IN (
      SELECT ph.home_id FROM sampling_plan_homes ph JOIN sampling_plans p ON p.id = ph.plan_id
      WHERE p.community_id IN (SELECT community_id FROM changed_rows)
      UNION
      SELECT h2.id FROM homes h2 WHERE h2.community_id IN (SELECT community_id FROM changed_rows)
    );
  ELSE
    SELECT array_agg(h.company_id), array_agg(h.merc_x), array_agg(h.merc_y) INTO company_ids, xs, ys
    FROM homes h WHERE h.id IN (SELECT home_id FROM changed_rows);
  END IF;
  PERFORM store_home_tiles_at(company_ids, xs, ys);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER sampling_plans_drawn_insert AFTER INSERT ON sampling_plans REFERENCING NEW TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION plans_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER sampling_plans_drawn_delete AFTER DELETE ON sampling_plans REFERENCING OLD TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION plans_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER sampling_plan_homes_drawn_insert AFTER INSERT ON sampling_plan_homes REFERENCING NEW TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION plans_drawn_changed();
--> statement-breakpoint
CREATE TRIGGER sampling_plan_homes_drawn_delete AFTER DELETE ON sampling_plan_homes REFERENCING OLD TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION plans_drawn_changed();
--> statement-breakpoint
SELECT store_home_tiles_at(array_agg(company_id), array_agg(merc_x), array_agg(merc_y)) FROM homes;
