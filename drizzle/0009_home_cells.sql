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
DROP INDEX "homes_company_merc_idx";--> statement-breakpoint
ALTER TABLE "home_cells" ADD CONSTRAINT "home_cells_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
-- Homes tiles read every home in a tile's extent: a covering index in (company, x, y) order with what
-- a tile draws and filters on lets PostgreSQL answer from the index alone once the table is vacuumed.
CREATE INDEX "homes_tile_idx" ON "homes" ("company_id", "merc_x", "merc_y")
  INCLUDE ("ref", "id", "outcome", "year_built", "last_vacuum_pa", "last_post_bq_m3", "rework_flag", "builder_id", "community_id");
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
-- Every cell of one company built again from its homes: for the first fill and for statements that
-- change many homes at once (an import), where grouping all homes beats looking up each cell.
CREATE FUNCTION rebuild_home_cells(company uuid) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM home_cells WHERE company_id = company;
  INSERT INTO home_cells (company_id, z, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework)
  SELECT company, z.z, merc_cell(h.merc_x, z.z), merc_cell(-h.merc_y, z.z), count(*)::int, min(outcome_attention_rank(h.outcome)),
         min(h.year_built), sum(h.last_vacuum_pa), count(h.last_vacuum_pa)::int, max(h.last_post_bq_m3), bool_or(h.rework_flag)
  FROM homes h, generate_series(11, 13) AS z(z)
  WHERE h.company_id = company
  GROUP BY 1, 2, 3, 4
  ORDER BY 2, 3, 4; -- stored in key order: a tile's cells sit on a few pages
END $$;
--> statement-breakpoint
-- The cells holding these points (one company, merc_x and merc_y per changed home, before and after)
-- counted again from the homes in them; a cell left without homes is removed.
CREATE FUNCTION refresh_home_cells_at(companies uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  IF coalesce(cardinality(xs), 0) > 5000 THEN
    PERFORM rebuild_home_cells(c) FROM (SELECT DISTINCT unnest(companies) AS c) s;
    RETURN;
  END IF;
  WITH touched AS (
    SELECT DISTINCT p.company_id, z.z, merc_cell(p.x, z.z) AS cx, merc_cell(-p.y, z.z) AS cy,
           40075016.685578488 / 2 ^ (z.z + 6) AS size
    FROM unnest(companies, xs, ys) AS p(company_id, x, y), generate_series(11, 13) AS z(z)
  ),
  fresh AS (
    SELECT t.company_id, t.z, t.cx, t.cy, a.*
    FROM touched t, LATERAL (
      SELECT count(*)::int AS homes, min(outcome_attention_rank(h.outcome)) AS outcome_rank, min(h.year_built) AS year_min,
             sum(h.last_vacuum_pa) AS vacuum_sum_pa, count(h.last_vacuum_pa)::int AS vacuum_count,
             max(h.last_post_bq_m3) AS post_max_bq_m3, coalesce(bool_or(h.rework_flag), false) AS rework
      FROM homes h
      -- The cell's extent (plus a metre, for rounding) finds the candidates by index; merc_cell decides.
      WHERE h.company_id = t.company_id
        AND h.merc_x BETWEEN -20037508.342789244 + t.cx * t.size - 1 AND -20037508.342789244 + (t.cx + 1) * t.size + 1
        AND h.merc_y BETWEEN 20037508.342789244 - (t.cy + 1) * t.size - 1 AND 20037508.342789244 - t.cy * t.size + 1
        AND merc_cell(h.merc_x, t.z) = t.cx AND merc_cell(-h.merc_y, t.z) = t.cy
    ) a
  ),
  emptied AS (
    DELETE FROM home_cells c USING fresh f
    WHERE f.homes = 0 AND c.company_id = f.company_id AND c.z = f.z AND c.cx = f.cx AND c.cy = f.cy
  )
  INSERT INTO home_cells (company_id, z, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework)
  SELECT company_id, z, cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework
  FROM fresh WHERE homes > 0
  ON CONFLICT (company_id, z, cx, cy) DO UPDATE SET
    homes = excluded.homes, outcome_rank = excluded.outcome_rank, year_min = excluded.year_min,
    vacuum_sum_pa = excluded.vacuum_sum_pa, vacuum_count = excluded.vacuum_count,
    post_max_bq_m3 = excluded.post_max_bq_m3, rework = excluded.rework;
END $$;
--> statement-breakpoint
-- Statement-level, with transition tables: an import of 100,000 homes refreshes the cells once. An
-- update refreshes only the homes whose place or drawn values changed (not a note or an owner's name).
CREATE FUNCTION refresh_home_cells() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'INSERT' THEN
    PERFORM refresh_home_cells_at(array_agg(company_id), array_agg(merc_x), array_agg(merc_y)) FROM new_rows;
  ELSIF TG_OP = 'DELETE' THEN
    PERFORM refresh_home_cells_at(array_agg(company_id), array_agg(merc_x), array_agg(merc_y)) FROM old_rows;
  ELSE
    PERFORM refresh_home_cells_at(array_agg(company_id), array_agg(x), array_agg(y)) FROM (
      SELECT side.company_id, side.x, side.y
      FROM old_rows o JOIN new_rows n ON n.id = o.id,
      LATERAL (VALUES (o.company_id, o.merc_x, o.merc_y), (n.company_id, n.merc_x, n.merc_y)) AS side(company_id, x, y)
      WHERE (o.company_id, o.merc_x, o.merc_y, o.outcome, o.year_built, o.last_vacuum_pa, o.last_post_bq_m3, o.rework_flag)
            IS DISTINCT FROM (n.company_id, n.merc_x, n.merc_y, n.outcome, n.year_built, n.last_vacuum_pa, n.last_post_bq_m3, n.rework_flag)
    ) changed;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER homes_cells_insert AFTER INSERT ON homes REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION refresh_home_cells();
--> statement-breakpoint
CREATE TRIGGER homes_cells_update AFTER UPDATE ON homes REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION refresh_home_cells();
--> statement-breakpoint
CREATE TRIGGER homes_cells_delete AFTER DELETE ON homes REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION refresh_home_cells();
--> statement-breakpoint
SELECT rebuild_home_cells(id) FROM companies;
