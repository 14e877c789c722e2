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

/** Tile coordinates per tile side (the MVT default) and the margin kept around a tile, in the same units. */
const EXTENT = 4096;
const BUFFER = 64;

/** `case outcome when 'needs_rework' then 1 …`: an outcome's rank in OUTCOME_PRIORITY (constants only). */
const OUTCOME_RANK = sql.raw(`case h.outcome ${OUTCOME_PRIORITY.map((o, i) => `when '${o}' then ${i + 1}`).join(' ')} end`);
const OUTCOME_BY_RANK = sql.raw(`array[${OUTCOME_PRIORITY.map((o) => `'${o}'`).join(',')}]::text[]`);

/**
 * One Mapbox Vector Tile (layer `homes`) of a company's homes, encoded by PostGIS ST_AsMVT.
 *
 * Homes keep their Web Mercator metres (merc_x, merc_y, generated from location), so a tile is a
 * range scan of the (company, merc_x, merc_y) index and plain arithmetic to the 4096 grid: no home
 * is projected or clipped at request time.
 *
 * From HOMES_DETAIL_MIN_ZOOM up every home is its own feature, with the home's short number (ref)
 * as the feature id so a tap can open it. Below that a tile can hold tens of thousands of homes too
 * close together to tap: they are drawn as one feature per 8-px cell, carrying the number of homes
 * and the outcome most in need of attention.
 */
export async function homesTile(db: DbOrTx, companyId: string, z: number, x: number, y: number, filter: MapFilter): Promise<Buffer> {
  const query = homesTileQuery(companyId, z, x, y, filter);
  // One tile is a few thousand rows: starting parallel workers costs more than it saves, and the
  // cells of a dense overview tile must fit one hash table in memory.
  return db.transaction(async (tx) => {
    await tx.execute(sql`select set_config('max_parallel_workers_per_gather', '0', true), set_config('work_mem', '32MB', true)`);
    const result = await tx.execute<{ mvt: Buffer }>(query);
    return result.rows[0]?.mvt ?? Buffer.alloc(0);
  });
}

/** The statement behind homesTile (exported for EXPLAIN when tuning). */
export function homesTileQuery(companyId: string, z: number, x: number, y: number, filter: MapFilter): SQL {
  const conditions: SQL[] = [sql`h.company_id = ${companyId}`];
  if (filter.builderId) conditions.push(sql`h.builder_id = ${filter.builderId}`);
  if (filter.communityId) conditions.push(sql`h.community_id = ${filter.communityId}`);
  if (filter.yearFrom !== undefined) conditions.push(sql`h.year_built >= ${filter.yearFrom}`);
  if (filter.yearTo !== undefined) conditions.push(sql`h.year_built <= ${filter.yearTo}`);
  if (filter.outcome?.length) conditions.push(sql`h.outcome in ${filter.outcome}`);
  // The tile's west and north edges and the size of one tile unit, in Web Mercator metres; the homes
  // within BUFFER units around the tile are kept so symbols on a tile edge are drawn whole.
  const homesInTile = sql`
    with tile as (
      select ST_XMin(e) as x0, ST_YMax(e) as y0, (ST_XMax(e) - ST_XMin(e)) / ${EXTENT} as unit from ST_TileEnvelope(${z}, ${x}, ${y}) e
    ),
    planned_homes as (
      -- The homes in the latest sampling plan of each community; unvisited, they are drawn as "planned".
      select home_id from sampling_plan_homes where plan_id in (
        select distinct on (community_id) id from sampling_plans
        where company_id = ${companyId} order by community_id, created_at desc, id desc)
    ),
    points as (
      select (h.merc_x - tile.x0) / tile.unit as tx, (tile.y0 - h.merc_y) / tile.unit as ty,
        h.ref, h.outcome, h.year_built, h.last_vacuum_pa, h.last_post_bq_m3, h.rework_flag,
        (h.outcome = 'not_visited' and h.id in (select home_id from planned_homes)) as planned, ${OUTCOME_RANK} as outcome_rank
      from homes h, tile
      where ${sql.join(conditions, sql` and `)}
        and h.merc_x >= tile.x0 - ${BUFFER} * tile.unit and h.merc_x <= tile.x0 + ${EXTENT + BUFFER} * tile.unit
        and h.merc_y <= tile.y0 + ${BUFFER} * tile.unit and h.merc_y >= tile.y0 - ${EXTENT + BUFFER} * tile.unit
    )`;
  // Values are rounded half up in float8 (they are never negative): numeric rounding costs about a
  // quarter of the query on a dense tile, and float8 round() breaks ties to even (3.85 would show as 3.8).
  return z >= HOMES_DETAIL_MIN_ZOOM
      ? sql`${homesInTile}
    select ST_AsMVT(t.*, 'homes', ${EXTENT}, 'geom', 'ref') as mvt from (
      select ST_MakePoint(floor(tx + 0.5), floor(ty + 0.5)) as geom, ref, outcome, year_built as year,
        floor(last_vacuum_pa / ${IN_WC_TO_PA} * 100 + 0.5) / 100 as vacuum_in_wc,
        floor(last_post_bq_m3 / ${PCI_PER_L_TO_BQ_M3} * 10 + 0.5) / 10 as post_pci_l,
        rework_flag as rework, planned
      from points
    ) t`
      : sql`${homesInTile}
    select ST_AsMVT(t.*, 'homes', ${EXTENT}, 'geom') as mvt from (
      select
        ST_MakePoint(cx * ${OVERVIEW_CELL_UNITS} + ${OVERVIEW_CELL_UNITS / 2}, cy * ${OVERVIEW_CELL_UNITS} + ${OVERVIEW_CELL_UNITS / 2}) as geom,
        count(*)::int as homes,
        (${OUTCOME_BY_RANK})[min(outcome_rank)] as outcome,
        min(year_built) as year,
        floor(avg(last_vacuum_pa) / ${IN_WC_TO_PA} * 100 + 0.5) / 100 as vacuum_in_wc,
        floor(max(last_post_bq_m3) / ${PCI_PER_L_TO_BQ_M3} * 10 + 0.5) / 10 as post_pci_l,
        bool_or(rework_flag) as rework,
        bool_or(planned) as planned
      from (
        select floor(tx / ${OVERVIEW_CELL_UNITS})::int as cx, floor(ty / ${OVERVIEW_CELL_UNITS})::int as cy, * from points
      ) cells
      group by cx, cy
    ) t`;
}
