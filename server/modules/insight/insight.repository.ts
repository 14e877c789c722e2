import { sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client.js';
import { REWORK_REASONS } from '../../../shared/schemas/enums.js';

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

/** How many of the most common rework reasons each cell lists. */
const TOP_REASONS = 3;

/**
 * Builder × community × construction-year aggregates of a company's homes, computed by PostgreSQL
 * in one pass over homes: counts from the derived `sampled`/`failed` flags kept on each home
 * (server/modules/homes/home-summary.ts), medians of the homes' latest manometer vacuum and
 * post-mitigation level (percentile_cont, sampled homes only), and for each rework reason the number
 * of homes whose completed visits cited it (the derived `rework_reasons`). Homes without a builder
 * are left out.
 */
export async function builderYearCells(db: Db, companyId: string): Promise<CellRow[]> {
  const reasonCounts = sql.join(
    REWORK_REASONS.map((reason) => sql`count(*) filter (where ${reason} = any(h.rework_reasons))::int as ${sql.identifier(`reason_${reason}`)}`),
    sql`, `,
  );
  const rows = await db.transaction(async (tx) => {
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
             percentile_cont(0.5) within group (order by h.last_post_bq_m3) filter (where h.sampled) as median_post_bq_m3,
             ${reasonCounts}
      from homes h
      where h.company_id = ${companyId} and h.builder_id is not null
      group by h.builder_id, h.community_id, h.year_built
    )
    select ${sql.join(REWORK_REASONS.map((reason) => sql`c.${sql.identifier(`reason_${reason}`)}`), sql`, `)},
           c.homes, c.sampled, c.failures,
           c.builder_id::text as "builderId", b.name as "builderName",
           c.community_id::text as "communityId", m.name as "communityName",
           c.year_built as "yearBuilt",
           c.median_vacuum_pa as "medianVacuumPa", c.median_post_bq_m3 as "medianPostBqM3"
    from cells c
    join builders b on b.id = c.builder_id
    left join communities m on m.id = c.community_id
    order by b.name, m.name nulls last, c.year_built nulls last`);
    return result.rows;
  });
  return rows.map((r) => ({
    builderId: r.builderId as string,
    builderName: r.builderName as string,
    communityId: (r.communityId as string | null) ?? null,
    communityName: (r.communityName as string | null) ?? null,
    yearBuilt: (r.yearBuilt as number | null) ?? null,
    homes: r.homes as number,
    sampled: r.sampled as number,
    failures: r.failures as number,
    medianVacuumPa: (r.medianVacuumPa as number | null) ?? null,
    medianPostBqM3: (r.medianPostBqM3 as number | null) ?? null,
    topReworkReasons: REWORK_REASONS.map((reason) => ({ reason, count: r[`reason_${reason}`] as number }))
      .filter((x) => x.count > 0)
      .sort((a, b) => b.count - a.count || (a.reason < b.reason ? -1 : 1))
      .slice(0, TOP_REASONS),
  }));
}

/** Homes of each builder in a community (for weighting a multi-builder community's pooled prior). */
export async function buildersInCommunity(db: DbOrTx, companyId: string, communityId: string) {
  const result = await db.execute<{ builderId: string; homes: number }>(sql`
    select builder_id::text as "builderId", count(*)::int as homes
    from homes where company_id = ${companyId} and community_id = ${communityId} and builder_id is not null
    group by builder_id`);
  return result.rows;
}
