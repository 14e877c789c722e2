import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import type { MapFilter } from '../../../shared/schemas/map.js';
import { IN_WC_TO_PA, PCI_PER_L_TO_BQ_M3 } from '../../../shared/domain/units.js';

/**
 * One Mapbox Vector Tile (layer `homes`) of a company's homes, built by PostGIS:
 * the GiST index on location picks the homes in the tile's envelope, ST_AsMVTGeom clips and
 * quantises them to the 4096 grid, ST_AsMVT encodes the protobuf.
 */
export async function homesTile(db: DbOrTx, companyId: string, z: number, x: number, y: number, filter: MapFilter): Promise<Buffer> {
  const conditions: SQL[] = [sql`h.company_id = ${companyId}`];
  if (filter.builderId) conditions.push(sql`h.builder_id = ${filter.builderId}`);
  if (filter.communityId) conditions.push(sql`h.community_id = ${filter.communityId}`);
  if (filter.yearFrom !== undefined) conditions.push(sql`h.year_built >= ${filter.yearFrom}`);
  if (filter.yearTo !== undefined) conditions.push(sql`h.year_built <= ${filter.yearTo}`);
  if (filter.outcome?.length) conditions.push(sql`h.outcome in ${filter.outcome}`);
  const result = await db.execute<{ mvt: Buffer }>(sql`
    with latest_plans as (
      -- The latest sampling plan of each community; its unvisited homes are drawn as "planned".
      select distinct on (community_id) id from sampling_plans
      where company_id = ${companyId} order by community_id, created_at desc, id desc
    ),
    planned_homes as (select home_id from sampling_plan_homes where plan_id in (select id from latest_plans)),
    bounds as (select ST_TileEnvelope(${z}, ${x}, ${y}) as merc, ST_Transform(ST_TileEnvelope(${z}, ${x}, ${y}, margin => 0.02), 4326) as geo)
    select ST_AsMVT(t.*, 'homes', 4096, 'geom') as mvt from (
      select
        ST_AsMVTGeom(ST_Transform(h.location, 3857), bounds.merc, 4096, 64, true) as geom,
        h.id::text as id,
        h.outcome,
        h.year_built as year,
        round((h.last_vacuum_pa / ${IN_WC_TO_PA})::numeric, 2)::float8 as vacuum_in_wc,
        round((h.last_post_bq_m3 / ${PCI_PER_L_TO_BQ_M3})::numeric, 1)::float8 as post_pci_l,
        h.rework_flag as rework,
        (h.outcome = 'not_visited' and h.id in (select home_id from planned_homes)) as planned
      from homes h, bounds
      where h.location && bounds.geo and ${sql.join(conditions, sql` and `)}
    ) t where t.geom is not null`);
  return result.rows[0]?.mvt ?? Buffer.alloc(0);
}
