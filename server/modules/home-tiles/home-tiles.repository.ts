import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { HOMES_DETAIL_MIN_ZOOM, type MapFilter } from '../../../shared/schemas/map.js';
import { OUTCOMES } from '../../../shared/schemas/enums.js';
import { IN_WC_TO_PA, PCI_PER_L_TO_BQ_M3 } from '../../../shared/domain/units.js';

/** Side of an overview cell in tile units (4096 per tile; MapLibre draws a tile 512 px wide, so 64 units = 8 px). */
export const OVERVIEW_CELL_UNITS = 64;

/** Which outcome an overview cell shows when its homes differ: the one that most needs attention. */
const OUTCOME_PRIORITY = ['needs_rework', 'awaiting_test', 'reworked_below', 'below_action_level', 'declined', 'not_visited'] as const;
if (OUTCOME_PRIORITY.length !== OUTCOMES.length) throw new Error('OUTCOME_PRIORITY must list every outcome');

/** The company's homes version: bumped by trigger with every change to its homes or sampling plans. */
export async function homesVersion(db: DbOrTx, companyId: string): Promise<number> {
  const result = await db.execute<{ v: string }>(sql`select homes_version::text as v from companies where id = ${companyId}`);
  return Number(result.rows[0]?.v ?? 0);
}

/**
 * One Mapbox Vector Tile (layer `homes`) of a company's homes, built by PostGIS: the GiST index on
 * location picks the homes in the tile's envelope, ST_AsMVTGeom clips and quantises them to the 4096
 * grid, ST_AsMVT encodes the protobuf.
 *
 * From HOMES_DETAIL_MIN_ZOOM up every home is its own feature (with its id, so a tap opens it). Below
 * that a tile can hold tens of thousands of homes too close together to tap: they are drawn as one
 * feature per 8-px cell, carrying the number of homes and the outcome most in need of attention.
 */
export async function homesTile(db: DbOrTx, companyId: string, z: number, x: number, y: number, filter: MapFilter): Promise<Buffer> {
  const conditions: SQL[] = [sql`h.company_id = ${companyId}`];
  if (filter.builderId) conditions.push(sql`h.builder_id = ${filter.builderId}`);
  if (filter.communityId) conditions.push(sql`h.community_id = ${filter.communityId}`);
  if (filter.yearFrom !== undefined) conditions.push(sql`h.year_built >= ${filter.yearFrom}`);
  if (filter.yearTo !== undefined) conditions.push(sql`h.year_built <= ${filter.yearTo}`);
  if (filter.outcome?.length) conditions.push(sql`h.outcome in ${filter.outcome}`);
  const homesInTile = sql`
    with latest_plans as (
      -- The latest sampling plan of each community; its unvisited homes are drawn as "planned".
      select distinct on (community_id) id from sampling_plans
      where company_id = ${companyId} order by community_id, created_at desc, id desc
    ),
    bounds as (select ST_TileEnvelope(${z}, ${x}, ${y}) as merc, ST_Transform(ST_TileEnvelope(${z}, ${x}, ${y}, margin => 0.02), 4326) as geo),
    points as materialized (
      select
        ST_AsMVTGeom(ST_Transform(h.location, 3857), bounds.merc, 4096, 64, true) as geom,
        h.id, h.outcome, h.year_built, h.last_vacuum_pa, h.last_post_bq_m3, h.rework_flag,
        (h.outcome = 'not_visited' and exists (
          select 1 from sampling_plan_homes sph where sph.home_id = h.id and sph.plan_id in (select id from latest_plans))) as planned
      from homes h, bounds
      where h.location && bounds.geo and ${sql.join(conditions, sql` and `)}
    )`;
  const query =
    z >= HOMES_DETAIL_MIN_ZOOM
      ? sql`${homesInTile}
    select ST_AsMVT(t.*, 'homes', 4096, 'geom') as mvt from (
      -- Rounded half up in float8 (values are never negative): numeric rounding costs about a quarter of
      -- the query on a dense tile, and float8 round() breaks ties to even (3.85 would show as 3.8).
      select geom, id::text as id, outcome, year_built as year,
        floor(last_vacuum_pa / ${IN_WC_TO_PA} * 100 + 0.5) / 100 as vacuum_in_wc,
        floor(last_post_bq_m3 / ${PCI_PER_L_TO_BQ_M3} * 10 + 0.5) / 10 as post_pci_l,
        rework_flag as rework, planned
      from points where geom is not null
    ) t`
      : sql`${homesInTile}
    select ST_AsMVT(t.*, 'homes', 4096, 'geom') as mvt from (
      select
        ST_MakePoint(cx * ${OVERVIEW_CELL_UNITS} + ${OVERVIEW_CELL_UNITS / 2}, cy * ${OVERVIEW_CELL_UNITS} + ${OVERVIEW_CELL_UNITS / 2}) as geom,
        count(*)::int as homes,
        (array_agg(outcome order by array_position(${sql.raw(`array[${OUTCOME_PRIORITY.map((o) => `'${o}'`).join(',')}]`)}::text[], outcome)))[1] as outcome,
        min(year_built) as year,
        floor(avg(last_vacuum_pa) / ${IN_WC_TO_PA} * 100 + 0.5) / 100 as vacuum_in_wc,
        floor(max(last_post_bq_m3) / ${PCI_PER_L_TO_BQ_M3} * 10 + 0.5) / 10 as post_pci_l,
        bool_or(rework_flag) as rework,
        bool_or(planned) as planned
      from (
        select floor(ST_X(geom) / ${OVERVIEW_CELL_UNITS})::int as cx, floor(ST_Y(geom) / ${OVERVIEW_CELL_UNITS})::int as cy, *
        from points where geom is not null
      ) cells
      group by cx, cy
    ) t`;
  // One tile is a few thousand rows: starting parallel workers costs more than it saves.
  return db.transaction(async (tx) => {
    await tx.execute(sql`set local max_parallel_workers_per_gather = 0`);
    const result = await tx.execute<{ mvt: Buffer }>(query);
    return result.rows[0]?.mvt ?? Buffer.alloc(0);
  });
}
