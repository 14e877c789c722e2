-- Found in review: two transactions changing homes of one company at once could each count a cell from
-- what they saw, and the later commit kept a count that missed the other's change. Cell refreshes now
-- take a per-company lock first. Tile versions are written in one order (no deadlock between writers)
-- and not for a company being deleted (its homes go with it; the version rows would fail their key).
CREATE OR REPLACE FUNCTION refresh_home_cells_at(companies uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
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
CREATE OR REPLACE FUNCTION bump_home_tiles_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
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
