import type pg from 'pg';
import { HOMES_DETAIL_MIN_ZOOM, HOMES_MIN_ZOOM } from '../../shared/schemas/map.js';

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
