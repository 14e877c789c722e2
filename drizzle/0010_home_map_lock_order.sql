-- Two fixes to the map's triggers of 0008 and 0009.
--
-- 1. One order for the two locks a change to a company's map takes: the advisory lock (7001, company)
--    first, then the company's row (homes_version). A sampling plan's triggers already took them in that
--    order (sampling_plans_drawn_* sorts before sampling_plans_version_*), but a statement changing more
--    than 2,000 homes bumped homes_version first and took the advisory lock after: an import and a new
--    plan of the same company could deadlock. Now every path goes through lock_home_map() before it
--    bumps, and an import that defers its map (tractwise.home_cells_deferred) takes neither lock until it
--    refreshes the map once, at its end: visits of the company carry on while its homes are written.
-- 2. A home at the edge of the Web Mercator square (longitude 180, latitude ±85.05) has a margin that
--    reaches past it: tile column 2^z or row -1, which ST_TileEnvelope refuses. Only tiles inside the
--    square are kept.

-- The locks of these companies' maps, held until the transaction ends: taken before anything reads the
-- homes to draw or bumps a version, in company order.
CREATE FUNCTION lock_home_map(company_ids uuid[]) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_advisory_xact_lock(7001, hashtext(c::text)) FROM (SELECT DISTINCT unnest(company_ids) AS c ORDER BY 1) s WHERE c IS NOT NULL;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION bump_home_tiles_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  v bigint;
BEGIN
  IF coalesce(cardinality(company_ids), 0) = 0 THEN
    RETURN;
  END IF;
  PERFORM lock_home_map(company_ids);
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
    AND tx.t BETWEEN 0 AND (1 << z.z) - 1 AND ty.t BETWEEN 0 AND (1 << z.z) - 1
    AND EXISTS (SELECT 1 FROM companies c WHERE c.id = p.company_id) -- not for a company being deleted
  ORDER BY 1, 2, 3, 4 -- rows locked in one order by every writer: no deadlock between two
  ON CONFLICT (company_id, z, x, y) DO UPDATE SET version = excluded.version;
END $$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION store_home_tiles_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
DECLARE
  grid constant double precision := CASE WHEN coalesce(cardinality(company_ids), 0) > 2000 THEN 40075016.685578488 / 2 ^ 14 / 16 ELSE 0 END;
BEGIN
  IF coalesce(cardinality(company_ids), 0) = 0 THEN
    RETURN;
  END IF;
  -- One writer of a company's map at a time, until it commits (as in refresh_home_cells_at): each tile
  -- is encoded by a statement of its own, so under READ COMMITTED it sees what the writer before committed.
  PERFORM lock_home_map(company_ids);
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
    WHERE tx.t BETWEEN 0 AND (1 << z.z) - 1 AND ty.t BETWEEN 0 AND (1 << z.z) - 1
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
-- What the map shows of these points, made current: the cached tiles that draw them get new versions,
-- their overview cells are counted again, then the stored tiles that draw them are encoded again. The
-- homes trigger calls this after each statement; an import that defers it calls it once before it commits.
CREATE OR REPLACE FUNCTION refresh_home_map_at(company_ids uuid[], xs double precision[], ys double precision[]) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  PERFORM lock_home_map(company_ids);
  PERFORM bump_home_tiles_at(company_ids, xs, ys);
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
  IF current_setting('tractwise.home_cells_deferred', true) IS NOT DISTINCT FROM 'on' THEN
    RETURN NULL; -- the import refreshes its homes' map itself (refresh_home_map_at), once
  END IF;
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
  PERFORM refresh_home_map_at(company_ids, xs, ys);
  RETURN NULL;
END $$;
--> statement-breakpoint
-- The lock first, then the homes: a home moved by a writer that held the lock is read where it now is.
CREATE OR REPLACE FUNCTION plans_drawn_changed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  company_ids uuid[];
  xs double precision[];
  ys double precision[];
BEGIN
  IF TG_TABLE_NAME = 'sampling_plans' THEN
    PERFORM lock_home_map((SELECT array_agg(DISTINCT company_id) FROM changed_rows));
    SELECT array_agg(h.company_id), array_agg(h.merc_x), array_agg(h.merc_y) INTO company_ids, xs, ys
    FROM homes h
    WHERE h.id IN (
      SELECT ph.home_id FROM sampling_plan_homes ph JOIN sampling_plans p ON p.id = ph.plan_id
      WHERE p.community_id IN (SELECT community_id FROM changed_rows)
      UNION
      SELECT h2.id FROM homes h2 WHERE h2.community_id IN (SELECT community_id FROM changed_rows)
    );
  ELSE
    PERFORM lock_home_map((SELECT array_agg(DISTINCT h.company_id) FROM homes h WHERE h.id IN (SELECT home_id FROM changed_rows)));
    SELECT array_agg(h.company_id), array_agg(h.merc_x), array_agg(h.merc_y) INTO company_ids, xs, ys
    FROM homes h WHERE h.id IN (SELECT home_id FROM changed_rows);
  END IF;
  PERFORM store_home_tiles_at(company_ids, xs, ys);
  RETURN NULL;
END $$;
