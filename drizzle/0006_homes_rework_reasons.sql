ALTER TABLE "homes" ADD COLUMN "rework_reasons" text[] DEFAULT '{}'::text[] NOT NULL;--> statement-breakpoint
-- Backfill the derived reasons from the visits already stored (server/modules/homes/home-summary.ts keeps them after this).
UPDATE "homes" h SET "rework_reasons" = r.reasons
FROM (
  SELECT v.home_id, array_agg(DISTINCT x.reason ORDER BY x.reason) AS reasons
  FROM "visits" v, unnest(v.rework_reasons) AS x(reason)
  WHERE v.status = 'completed'
  GROUP BY v.home_id
) r
WHERE r.home_id = h.id;
