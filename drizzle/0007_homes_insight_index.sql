-- The builder comparison reads every home of a company grouped by builder, community and year: a
-- covering index in that order lets PostgreSQL answer it with an index-only scan, already sorted.
CREATE INDEX IF NOT EXISTS "homes_insight_idx" ON "homes" ("company_id", "builder_id", "community_id", "year_built")
  INCLUDE ("sampled", "failed", "last_vacuum_pa", "last_post_bq_m3", "rework_reasons");
