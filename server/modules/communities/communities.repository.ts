import { and, asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { communities, communityBuilders, homes } from '../../db/schema/tables.js';
import type { PolygonGeometry } from '../../../shared/schemas/common.js';
import { lockHomesReferring } from '../homes/homes.repository.js';

const communityColumns = {
  id: communities.id,
  name: communities.name,
  boundary: sql<PolygonGeometry | null>`ST_AsGeoJSON(ST_GeometryN(${communities.boundary}, 1), 7)::json`,
  builderIds: sql<string[]>`coalesce((select array_agg(cb.builder_id::text order by cb.builder_id) from ${communityBuilders} cb where cb.community_id = ${communities.id}), '{}')`,
  yearFrom: communities.yearFrom,
  yearTo: communities.yearTo,
  jurisdiction: communities.jurisdiction,
  passiveRequired: communities.passiveRequired,
  homeCount: sql<number>`(select count(*)::int from ${homes} where ${homes.communityId} = ${communities.id})`,
};

export const boundarySql = (boundary: PolygonGeometry) =>
  sql`ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(boundary)}), 4326))`;

export async function isValidPolygon(db: DbOrTx, boundary: PolygonGeometry): Promise<boolean> {
  const result = await db.execute<{ valid: boolean }>(sql`select ST_IsValid(ST_GeomFromGeoJSON(${JSON.stringify(boundary)})) as valid`);
  return result.rows[0]?.valid === true;
}

export function listCommunities(db: DbOrTx, companyId: string) {
  return db.select(communityColumns).from(communities).where(eq(communities.companyId, companyId)).orderBy(asc(communities.name));
}

export async function findCommunity(db: DbOrTx, companyId: string, id: string) {
  const [row] = await db
    .select(communityColumns)
    .from(communities)
    .where(and(eq(communities.companyId, companyId), eq(communities.id, id)));
  return row;
}

type Values = {
  name?: string;
  boundary?: PolygonGeometry;
  yearFrom?: number | null;
  yearTo?: number | null;
  jurisdiction?: string;
  passiveRequired?: boolean | null;
};

function columnsOf(values: Values) {
  const { boundary, ...rest } = values;
  return { ...rest, ...(boundary ? { boundary: boundarySql(boundary) as unknown as string } : {}) };
}

export async function insertCommunity(db: DbOrTx, companyId: string, values: Values) {
  const [row] = await db
    .insert(communities)
    .values({ companyId, name: values.name!, ...columnsOf(values) })
    .returning({ id: communities.id });
  return row.id;
}

export async function updateCommunity(db: DbOrTx, companyId: string, id: string, values: Values) {
  const set = columnsOf(values);
  const where = and(eq(communities.companyId, companyId), eq(communities.id, id));
  if (Object.keys(set).length === 0) {
    const [row] = await db.select({ id: communities.id }).from(communities).where(where);
    return row?.id;
  }
  const [row] = await db.update(communities).set(set).where(where).returning({ id: communities.id });
  return row?.id;
}

export async function replaceCommunityBuilders(db: DbOrTx, communityId: string, builderIds: string[]) {
  await db.delete(communityBuilders).where(eq(communityBuilders.communityId, communityId));
  if (builderIds.length > 0) {
    await db.insert(communityBuilders).values(builderIds.map((builderId) => ({ communityId, builderId })));
  }
}

/**
 * Deletes a community: its homes lose it (set null) and its plans go (cascade, whose triggers take the
 * map's lock), so its homes are locked first (lockHomesReferring). Call inside a transaction.
 */
export async function deleteCommunity(db: DbOrTx, companyId: string, id: string) {
  await lockHomesReferring(db, companyId, { communityId: id });
  const rows = await db
    .delete(communities)
    .where(and(eq(communities.companyId, companyId), eq(communities.id, id)))
    .returning({ id: communities.id });
  return rows.length > 0;
}
