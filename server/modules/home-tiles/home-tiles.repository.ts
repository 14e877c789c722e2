import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { HOMES_DETAIL_MIN_ZOOM, HOMES_MAX_TILE_ZOOM, type MapFilter } from '../../../shared/schemas/map.js';
import { OUTCOMES } from '../../../shared/schemas/enums.js';
import { IN_WC_TO_PA, PCI_PER_L_TO_BQ_M3 } from '../../../shared/domain/units.js';
import { plannedHomeIds } from '../homes/homes.repository.js';

/** Side of an overview cell in tile units (4096 per tile; MapLibre draws a tile 512 px wide, so 64 units = 8 px). */
export const OVERVIEW_CELL_UNITS = 64;

/** Which outcome an overview cell shows when its homes differ: the one that most needs attention. */
export const OUTCOME_PRIORITY = ['needs_rework', 'awaiting_test', 'reworked_below', 'below_action_level', 'declined', 'not_visited'] as const;
if (OUTCOME_PRIORITY.length !== OUTCOMES.length) throw new Error('OUTCOME_PRIORITY must list every outcome');

/**
 * What a cached tile is valid for: the company's homes version (bumped by trigger for changes too wide to
 * list tile by tile: sampling plans, statements of more than 2,000 homes) and the tile's own version
 * (bumped by trigger when a home it draws changes). A tile deeper than HOMES_MAX_TILE_ZOOM takes the
 * version of the tile it lies in at that zoom.
 */
export async function tileVersions(db: DbOrTx, companyId: string, z: number, x: number, y: number): Promise<{ company: number; tile: number }> {
  const shift = Math.max(0, z - HOMES_MAX_TILE_ZOOM);
  const result = await db.execute<{ company: string; tile: string | null }>(sql`
    select c.homes_version::text as company, t.version::text as tile
    from companies c left join home_tile_versions t on t.company_id = c.id and t.z = ${z - shift} and t.x = ${Math.floor(x / 2 ** shift)} and t.y = ${Math.floor(y / 2 ** shift)}
    where c.id = ${companyId}`);
  const row = result.rows[0];
  return { company: Number(row?.company ?? 0), tile: Number(row?.tile ?? 0) };
}

/** Tile coordinates per tile side (the MVT default) and the margin kept around a tile, in the same units. */
const EXTENT = 4096;
const BUFFER = 64;
/** Overview cells per tile side. */
const CELLS = EXTENT / OVERVIEW_CELL_UNITS;

/** Which outcome has attention rank n (1-based, as outcome_attention_rank() in SQL gives it). */
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
 * and the outcome most in need of attention. Without filters those cells are read from home_cells,
 * which database triggers keep; with filters they are counted from the matching homes.
 *
 * A property without a value is left out of the feature (MVT spec 2.1 §4.2 needs no tag for it):
 * `rework` and `planned` appear only when true, `vacuum_in_wc` and `post_pci_l` only once measured.
 * Most homes are unvisited, so this keeps a tile about a seventh smaller for a phone in the field.
 */
export async function homesTile(db: DbOrTx, companyId: string, z: number, x: number, y: number, filter: MapFilter): Promise<Buffer> {
  // db: the tile connections (Database.tiles), set up with no parallel workers and room to hash cells.
  // The tile comes back as base64 text: node-postgres reads bytea as hex, twice the bytes, and a
  // dense tile (80-90 KB) arrived 1.3 ms later at the median that way (measured here).
  const result = await db.execute<{ mvt: string }>(sql`select encode(q.mvt, 'base64') as mvt from (${homesTileQuery(companyId, z, x, y, filter)}) q`);
  return Buffer.from(result.rows[0]?.mvt ?? '', 'base64');
}

const isFiltered = (f: MapFilter) =>
  Boolean(f.builderId || f.communityId || f.yearFrom !== undefined || f.yearTo !== undefined || f.outcome?.length);

/** The statement behind homesTile (exported for EXPLAIN when tuning, and for tests). */
export function homesTileQuery(companyId: string, z: number, x: number, y: number, filter: MapFilter, options: { liveCells?: boolean } = {}): SQL {
  const conditions: SQL[] = [sql`h.company_id = ${companyId}`];
  if (filter.builderId) conditions.push(sql`h.builder_id = ${filter.builderId}`);
  if (filter.communityId) conditions.push(sql`h.community_id = ${filter.communityId}`);
  if (filter.yearFrom !== undefined) conditions.push(sql`h.year_built >= ${filter.yearFrom}`);
  if (filter.yearTo !== undefined) conditions.push(sql`h.year_built <= ${filter.yearTo}`);
  if (filter.outcome?.length) conditions.push(sql`h.outcome in ${filter.outcome}`);
  // The tile's west and north edges and the size of one tile unit, in Web Mercator metres.
  const tile = sql`tile as (
      select ST_XMin(e) as x0, ST_YMax(e) as y0, (ST_XMax(e) - ST_XMin(e)) / ${EXTENT} as unit from ST_TileEnvelope(${z}, ${x}, ${y}) e
    )`;
  // Unvisited, these homes are drawn as "planned".
  const plannedHomes = sql`planned_homes as (${plannedHomeIds(companyId)})`;
  // The homes within BUFFER units around the tile are kept, so symbols on a tile edge are drawn whole.
  const homesInTile = sql`
    from homes h, tile
    where ${sql.join(conditions, sql` and `)}
      and h.merc_x >= tile.x0 - ${BUFFER} * tile.unit and h.merc_x <= tile.x0 + ${EXTENT + BUFFER} * tile.unit
      and h.merc_y <= tile.y0 + ${BUFFER} * tile.unit and h.merc_y >= tile.y0 - ${EXTENT + BUFFER} * tile.unit`;
  const isPlanned = sql`(h.outcome = 'not_visited' and h.id in (select home_id from planned_homes))`;

  if (z >= HOMES_DETAIL_MIN_ZOOM) {
    // Values are rounded half up in float8 (they are never negative): numeric rounding costs about a
    // quarter of the query on a dense tile, and float8 round() breaks ties to even (3.85 would show as 3.8).
    return sql`with ${tile}, ${plannedHomes}
    select ST_AsMVT(t.*, 'homes', ${EXTENT}, 'geom', 'ref') as mvt from (
      select ST_MakePoint(floor((h.merc_x - tile.x0) / tile.unit + 0.5), floor((tile.y0 - h.merc_y) / tile.unit + 0.5)) as geom,
        h.ref, h.outcome, h.year_built as year,
        floor(h.last_vacuum_pa / ${IN_WC_TO_PA} * 100 + 0.5) / 100 as vacuum_in_wc,
        floor(h.last_post_bq_m3 / ${PCI_PER_L_TO_BQ_M3} * 10 + 0.5) / 10 as post_pci_l,
        nullif(h.rework_flag, false) as rework, nullif(${isPlanned}, false) as planned
      ${homesInTile}
    ) t`;
  }

  // Overview: cells numbered over the whole grid by merc_cell() (as home_cells keeps them), drawn at
  // their centre in tile units; the ring of cells around the tile is the buffer.
  // Planned homes are a few per community: found from the plans, not by looking at every home.
  const plannedCells = sql`planned_cells as (
      select distinct merc_cell(h.merc_x, ${z}) as cx, merc_cell(-h.merc_y, ${z}) as cy
      from planned_homes p join homes h on h.id = p.home_id
      where ${sql.join(conditions, sql` and `)} and h.outcome = 'not_visited'
    )`;
  const cells =
    isFiltered(filter) || options.liveCells
      ? sql`cells as (
      select merc_cell(h.merc_x, ${z}) as cx, merc_cell(-h.merc_y, ${z}) as cy, count(*)::int as homes,
        min(outcome_attention_rank(h.outcome)) as outcome_rank, min(h.year_built) as year_min,
        sum(h.last_vacuum_pa) as vacuum_sum_pa, count(h.last_vacuum_pa)::int as vacuum_count,
        max(h.last_post_bq_m3) as post_max_bq_m3, bool_or(h.rework_flag) as rework
      ${homesInTile}
      group by 1, 2
    )`
      : sql`cells as (
      select cx, cy, homes, outcome_rank, year_min, vacuum_sum_pa, vacuum_count, post_max_bq_m3, rework
      from home_cells
      where company_id = ${companyId} and z = ${z}
        and cx between ${x * CELLS - 1} and ${x * CELLS + CELLS} and cy between ${y * CELLS - 1} and ${y * CELLS + CELLS}
    )`;
  return sql`with ${tile}, ${plannedHomes}, ${plannedCells}, ${cells}
    select ST_AsMVT(t.*, 'homes', ${EXTENT}, 'geom') as mvt from (
      select
        ST_MakePoint((c.cx - ${x * CELLS}) * ${OVERVIEW_CELL_UNITS} + ${OVERVIEW_CELL_UNITS / 2}, (c.cy - ${y * CELLS}) * ${OVERVIEW_CELL_UNITS} + ${OVERVIEW_CELL_UNITS / 2}) as geom,
        c.homes,
        (${OUTCOME_BY_RANK})[c.outcome_rank] as outcome,
        c.year_min as year,
        floor(c.vacuum_sum_pa / nullif(c.vacuum_count, 0) / ${IN_WC_TO_PA} * 100 + 0.5) / 100 as vacuum_in_wc,
        floor(c.post_max_bq_m3 / ${PCI_PER_L_TO_BQ_M3} * 10 + 0.5) / 10 as post_pci_l,
        nullif(c.rework, false) as rework,
        nullif(exists (select 1 from planned_cells p where p.cx = c.cx and p.cy = c.cy), false) as planned
      from cells c
      where c.cx between ${x * CELLS - 1} and ${x * CELLS + CELLS} and c.cy between ${y * CELLS - 1} and ${y * CELLS + CELLS}
    ) t`;
}
