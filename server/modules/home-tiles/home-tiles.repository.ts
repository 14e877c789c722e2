import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { HOMES_MAX_TILE_ZOOM, HOMES_MIN_ZOOM, type MapFilter } from '../../../shared/schemas/map.js';
import { OUTCOMES } from '../../../shared/schemas/enums.js';

/**
 * Which outcome an overview cell shows when its homes differ: the one that most needs attention. The SQL
 * functions outcome_attention_rank() and outcome_of_attention_rank() keep this order (tested).
 */
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

/** The deepest zoom whose unfiltered tiles are stored in home_tiles (encoded when their homes change). */
export const STORED_TILE_MAX_ZOOM = 14;

const isFiltered = (f: MapFilter) =>
  Boolean(f.builderId || f.communityId || f.yearFrom !== undefined || f.yearTo !== undefined || f.outcome?.length);

/**
 * One Mapbox Vector Tile (layer `homes`) of a company's homes, and whether it was read from the stored
 * tiles or built now.
 *
 * What a tile draws is defined once, by the SQL function homes_tile_mvt() (migration 0009): from
 * HOMES_DETAIL_MIN_ZOOM up one feature per home, with homes.ref as the feature id so a tap can open it;
 * below, one mark per 8-px cell with the number of homes and the outcome most in need of attention.
 * The unfiltered tiles from HOMES_MIN_ZOOM to STORED_TILE_MAX_ZOOM are encoded by database triggers
 * when the homes or sampling plans they draw change, and kept in home_tiles (no row: no homes there),
 * so the first request after a visit or an import reads them. Filtered tiles and deeper zooms (a few
 * hundred homes at most) are built on request.
 */
export async function homesTile(db: DbOrTx, companyId: string, z: number, x: number, y: number, filter: MapFilter): Promise<{ data: Buffer; stored: boolean }> {
  // db: the tile connections (Database.tiles), set up with no parallel workers and room to hash cells.
  // The tile comes back as base64 text: node-postgres reads bytea as hex, twice the bytes, and a
  // dense tile (80-90 KB) arrived 1.3 ms later at the median that way (measured here).
  const stored = !isFiltered(filter) && z >= HOMES_MIN_ZOOM && z <= STORED_TILE_MAX_ZOOM;
  const query = stored
    ? sql`select encode(mvt, 'base64') as mvt from home_tiles where company_id = ${companyId} and z = ${z} and x = ${x} and y = ${y}`
    : sql`select encode(q.mvt, 'base64') as mvt from (${homesTileQuery(companyId, z, x, y, filter)}) q`;
  const result = await db.execute<{ mvt: string }>(query);
  return { data: Buffer.from(result.rows[0]?.mvt ?? '', 'base64'), stored };
}

/** The statement that builds a tile now (homes_tile_mvt); exported for tests, which compare it with the stored tiles. */
export function homesTileQuery(companyId: string, z: number, x: number, y: number, filter: MapFilter, options: { liveCells?: boolean } = {}): SQL {
  const outcomes = filter.outcome?.length ? sql`array[${sql.join(filter.outcome.map((o) => sql`${o}`), sql`, `)}]::text[]` : sql`null::text[]`;
  return sql`select homes_tile_mvt(${companyId}::uuid, ${z}::int, ${x}::int, ${y}::int, ${filter.builderId ?? null}::uuid,
    ${filter.communityId ?? null}::uuid, ${filter.yearFrom ?? null}::int, ${filter.yearTo ?? null}::int, ${outcomes}, ${options.liveCells ?? false}::boolean) as mvt`;
}
