import type pg from 'pg';
import { HOMES_DETAIL_MIN_ZOOM, HOMES_MIN_ZOOM } from '../../shared/schemas/map.js';
import { STORED_TILE_MAX_ZOOM } from '../../server/modules/home-tiles/home-tiles.repository.js';
import { decodeTile } from './tiles.js';

/** Every overview cell counted afresh from the homes; sums rounded, since adding in another order moves the last bits. */
const FROM_HOMES = `select company_id, z, merc_cell(merc_x, z) as cx, merc_cell(-merc_y, z) as cy, count(*)::int as homes,
    min(outcome_attention_rank(outcome)) as outcome_rank, min(year_built) as year_min, round(sum(last_vacuum_pa)::numeric, 6) as vacuum_sum_pa,
    count(last_vacuum_pa)::int as vacuum_count, max(last_post_bq_m3) as post_max_bq_m3, bool_or(rework_flag) as rework
  from homes, generate_series(${HOMES_MIN_ZOOM}, ${HOMES_DETAIL_MIN_ZOOM - 1}) as z group by 1, 2, 3, 4`;
const KEPT = `select company_id, z, cx, cy, homes, outcome_rank, year_min, round(vacuum_sum_pa::numeric, 6), vacuum_count, post_max_bq_m3, rework from home_cells`;

/** How many rows of home_cells differ from counting the homes afresh (0 when the triggers kept it right). */
export async function homeCellMismatches(pool: pg.Pool): Promise<number> {
  const { rows } = await pool.query(`select count(*)::int as n from ((${KEPT} except ${FROM_HOMES}) union all (${FROM_HOMES} except ${KEPT})) d`);
  return rows[0].n as number;
}

/**
 * The stored tiles (home_tiles) that differ from a tile built now: every tile from zoom 11 to 14 that
 * shows a home (the tile holding it, and a neighbour inside the square whose 64-unit margin reaches it), and every stored
 * one. Compared feature by feature, since PostgreSQL may hand the rows to the encoder in another order.
 */
export async function storedTileMismatches(pool: pg.Pool): Promise<string[]> {
  const { rows } = await pool.query<{ company_id: string; z: number; x: number; y: number; stored: string | null; fresh: string | null }>(`
    with tiles as (
      select distinct h.company_id, z.z, tx.t as x, ty.t as y
      from homes h, generate_series(${HOMES_MIN_ZOOM}, ${STORED_TILE_MAX_ZOOM}) as z(z),
        lateral (select 40075016.685578488 / 2 ^ z.z as size) s,
        lateral (select floor((h.merc_x + 20037508.342789244 + d.d * (s.size / 64 + 1)) / s.size)::int as t from (values (-1), (1)) as d(d)) tx,
        lateral (select floor((20037508.342789244 - h.merc_y + d.d * (s.size / 64 + 1)) / s.size)::int as t from (values (-1), (1)) as d(d)) ty
      where tx.t between 0 and (1 << z.z) - 1 and ty.t between 0 and (1 << z.z) - 1 -- tiles of the Web Mercator square only
      union
      select company_id, z, x, y from home_tiles
    )
    select t.company_id, t.z, t.x, t.y, encode(k.mvt, 'base64') as stored, encode(homes_tile_mvt(t.company_id, t.z, t.x, t.y), 'base64') as fresh
    from tiles t left join home_tiles k on k.company_id = t.company_id and k.z = t.z and k.x = t.x and k.y = t.y`);
  const features = (base64: string | null) => {
    const layer = decodeTile(new Uint8Array(Buffer.from(base64 ?? '', 'base64'))).layers.homes;
    if (!layer) return [];
    return Array.from({ length: layer.length }, (_, i) => {
      const f = layer.feature(i);
      return JSON.stringify([f.id, f.loadGeometry(), Object.entries(f.properties).sort(([a], [b]) => a.localeCompare(b))]);
    }).sort();
  };
  return rows
    .filter((r) => JSON.stringify(features(r.stored)) !== JSON.stringify(features(r.fresh)))
    .map((r) => `${r.z}/${r.x}/${r.y} (company ${r.company_id}): ${r.stored == null ? 'not stored' : r.fresh ? 'differs' : 'stored but empty'}`);
}

/** What the triggers keep for the map that differs from building it afresh: overview cells, then stored tiles (none when right). */
export async function homeMapMismatches(pool: pg.Pool): Promise<string[]> {
  const cells = await homeCellMismatches(pool);
  return [...(cells ? [`${cells} overview cells`] : []), ...(await storedTileMismatches(pool))];
}
