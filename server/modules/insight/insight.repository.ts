import { sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client.js';

export interface CellRow {
  builderId: string;
  builderName: string;
  communityId: string | null;
  communityName: string | null;
  yearBuilt: number | null;
  homes: number;
  sampled: number;
  failures: number;
  medianVacuumPa: number | null;
  medianPostBqM3: number | null;
  topReworkReasons: { reason: string; count: number }[];
}

/** Stands in for "no community" in join keys (no real row has the nil UUID). */
const NO_COMMUNITY = '00000000-0000-0000-0000-000000000000';

/** How many of the most common rework reasons each cell lists. */
const TOP_REASONS = 3;

/**
 * Builder × community × construction-year aggregates of a company's homes, computed by PostgreSQL
 * in one statement: counts from the derived `sampled`/`failed` flags kept on each home
 * (server/modules/homes/home-summary.ts), medians of the homes' latest manometer vacuum and
 * post-mitigation level (percentile_cont, sampled homes only), and the most common rework reasons
 * over completed visits (unnest of rework_reasons). Homes without a builder are left out.
 */
export async function builderYearCells(db: Db, companyId: string): Promise<CellRow[]> {
  return db.transaction(async (tx) => {
    // The per-cell medians sort every home once: give that sort memory instead of temporary files,
    // and skip JIT compilation, which costs more than it saves on a query that runs this briefly.
    await tx.execute(sql`set local work_mem = '64MB'`);
    await tx.execute(sql`set local jit = off`);
    const result = await tx.execute<Record<string, unknown>>(sql`
    with cells as (
      select h.builder_id, h.community_id, h.year_built,
             count(*)::int as homes,
             count(*) filter (where h.sampled)::int as sampled,
             count(*) filter (where h.sampled and h.failed)::int as failures,
             percentile_cont(0.5) within group (order by h.last_vacuum_pa) filter (where h.sampled) as median_vacuum_pa,
             percentile_cont(0.5) within group (order by h.last_post_bq_m3) filter (where h.sampled) as median_post_bq_m3
      from homes h
      where h.company_id = ${companyId} and h.builder_id is not null
      group by h.builder_id, h.community_id, h.year_built
    ),
    reason_counts as (
      select h.builder_id, h.community_id, h.year_built, r.reason, count(*)::int as n
      from visits v
      join homes h on h.id = v.home_id
      cross join lateral unnest(v.rework_reasons) as r(reason)
      where v.company_id = ${companyId} and v.status = 'completed' and cardinality(v.rework_reasons) > 0
        and h.builder_id is not null
      group by 1, 2, 3, 4
    ),
    ranked as (
      select *, row_number() over (partition by builder_id, community_id, year_built order by n desc, reason) as rank
      from reason_counts
    ),
    reasons as (
      select builder_id, community_id, year_built, json_agg(json_build_object('reason', reason, 'count', n) order by rank) as top
      from ranked where rank <= ${TOP_REASONS}
      group by 1, 2, 3
    )
    select c.builder_id::text as "builderId", b.name as "builderName",
           c.community_id::text as "communityId", m.name as "communityName",
           c.year_built as "yearBuilt", c.homes, c.sampled, c.failures,
           c.median_vacuum_pa as "medianVacuumPa", c.median_post_bq_m3 as "medianPostBqM3",
           coalesce(r.top, '[]'::json) as "topReworkReasons"
    from cells c
    join builders b on b.id = c.builder_id
    left join communities m on m.id = c.community_id
    -- Plain equality on non-null keys lets the planner hash this join (IS NOT DISTINCT FROM cannot be hashed).
    left join reasons r on r.builder_id = c.builder_id
      and coalesce(r.community_id, ${NO_COMMUNITY}::uuid) = coalesce(c.community_id, ${NO_COMMUNITY}::uuid)
      and coalesce(r.year_built, -1) = coalesce(c.year_built, -1)
    order by b.name, m.name nulls last, c.year_built nulls last`);
    return result.rows as unknown as CellRow[];
  });
}

/** Homes of each builder in a community (for weighting a multi-builder community's pooled prior). */
export async function buildersInCommunity(db: DbOrTx, companyId: string, communityId: string) {
  const result = await db.execute<{ builderId: string; homes: number }>(sql`
    select builder_id::text as "builderId", count(*)::int as homes
    from homes where company_id = ${companyId} and community_id = ${communityId} and builder_id is not null
    group by builder_id`);
  return result.rows;
}
