import { and, asc, eq, ilike, sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { builders, communities, homes, radonTests, visits } from '../../db/schema/tables.js';

/** Where a home is: what every list of homes and every map of them selects. */
export const homePlaceColumns = {
  id: homes.id,
  number: homes.number,
  street: homes.street,
  unit: homes.unit,
  lon: sql<number>`ST_X(${homes.location})`,
  lat: sql<number>`ST_Y(${homes.location})`,
};

/** Street order, then house numbers in numeric order ("9" before "10"). */
export const streetOrder = [homes.street, sql`length(${homes.number})`, homes.number] as const;

export const homeColumns = {
  ...homePlaceColumns,
  ref: homes.ref,
  city: homes.city,
  state: homes.state,
  zip: homes.zip,
  communityId: homes.communityId,
  communityName: communities.name,
  builderId: homes.builderId,
  builderName: builders.name,
  yearBuilt: homes.yearBuilt,
  foundation: homes.foundation,
  passiveSystem: homes.passiveSystem,
  pipeSizeIn: homes.pipeSizeIn,
  suctionPointNote: homes.suctionPointNote,
  outcome: homes.outcome,
  doNotContact: homes.doNotContact,
  ownerName: homes.ownerName,
  mailingAddress: homes.mailingAddress,
};

export type HomeRow = Awaited<ReturnType<typeof findHome>> & {};

function baseQuery(db: DbOrTx) {
  return db
    .select(homeColumns)
    .from(homes)
    .leftJoin(communities, eq(communities.id, homes.communityId))
    .leftJoin(builders, eq(builders.id, homes.builderId));
}

export async function findHome(db: DbOrTx, companyId: string, id: string) {
  const [row] = await baseQuery(db).where(and(eq(homes.companyId, companyId), eq(homes.id, id)));
  return row;
}

/** The id of the company's home with this short number, if there is one. */
export async function findHomeIdByRef(db: DbOrTx, companyId: string, ref: number): Promise<string | undefined> {
  const [row] = await db.select({ id: homes.id }).from(homes).where(and(eq(homes.companyId, companyId), eq(homes.ref, ref)));
  return row?.id;
}

export async function listHomes(
  db: DbOrTx,
  companyId: string,
  filter: { communityId?: string; builderId?: string; outcome?: string; q?: string; limit: number; offset: number },
) {
  const conditions: SQL[] = [eq(homes.companyId, companyId)];
  if (filter.communityId) conditions.push(eq(homes.communityId, filter.communityId));
  if (filter.builderId) conditions.push(eq(homes.builderId, filter.builderId));
  if (filter.outcome) conditions.push(eq(homes.outcome, filter.outcome));
  if (filter.q) conditions.push(ilike(sql`${homes.number} || ' ' || ${homes.street}`, `%${filter.q.replace(/[%_\\]/g, '\\$&')}%`));
  const where = and(...conditions);
  const [rows, [{ total }]] = await Promise.all([
    baseQuery(db).where(where).orderBy(asc(homes.street), sql`length(${homes.number})`, asc(homes.number)).limit(filter.limit).offset(filter.offset),
    db.select({ total: sql<number>`count(*)::int` }).from(homes).where(where),
  ]);
  return { rows, total };
}

export const pointSql = (lon: number, lat: number) => sql`ST_SetSRID(ST_MakePoint(${lon}, ${lat}), 4326)`;

/** The community whose boundary contains the point, if any (GiST-indexed ST_Contains). */
export async function communityAt(db: DbOrTx, companyId: string, lon: number, lat: number) {
  const result = await db.execute<{ id: string }>(
    sql`select id from communities where company_id = ${companyId} and ST_Contains(boundary, ${pointSql(lon, lat)}) limit 1`,
  );
  return result.rows[0]?.id ?? null;
}

export type HomeWrite = Partial<Omit<typeof homes.$inferInsert, 'location' | 'companyId' | 'id'>> & { lon?: number; lat?: number };

function columnsOf(values: HomeWrite) {
  const { lon, lat, ...rest } = values;
  return { ...rest, ...(lon !== undefined && lat !== undefined ? { location: pointSql(lon, lat) as unknown as string } : {}) };
}

export async function insertHome(db: DbOrTx, companyId: string, values: HomeWrite & { addressKey: string }) {
  const [row] = await db
    .insert(homes)
    .values({ ...(columnsOf(values) as typeof homes.$inferInsert), companyId })
    .returning({ id: homes.id });
  return row.id;
}

export async function updateHome(db: DbOrTx, companyId: string, id: string, values: HomeWrite) {
  const [row] = await db
    .update(homes)
    .set({ ...columnsOf(values), updatedAt: new Date() })
    .where(and(eq(homes.companyId, companyId), eq(homes.id, id)))
    .returning({ id: homes.id });
  return row?.id;
}

export async function deleteHome(db: DbOrTx, companyId: string, id: string) {
  const rows = await db.delete(homes).where(and(eq(homes.companyId, companyId), eq(homes.id, id))).returning({ id: homes.id });
  return rows.length > 0;
}

export async function referenceBelongs(db: DbOrTx, companyId: string, table: 'communities' | 'builders', id: string) {
  const target = table === 'communities' ? communities : builders;
  const [row] = await db.select({ id: target.id }).from(target).where(and(eq(target.companyId, companyId), eq(target.id, id)));
  return Boolean(row);
}

/**
 * Locks the home's row for the rest of the transaction, so writes that change its derived summary
 * (visits, tests) are applied one after another. False when the company has no such home.
 */
/**
 * Locks, in id order, the company's homes that refer to this builder or community: a delete that sets them
 * to null locks them first, as every writer of homes does before the rows they refer to and the map's lock
 * (DEVELOPERS.md, "Locks"). Call inside a transaction.
 */
export async function lockHomesReferring(db: DbOrTx, companyId: string, to: { builderId: string } | { communityId: string }) {
  const refers = 'builderId' in to ? eq(homes.builderId, to.builderId) : eq(homes.communityId, to.communityId);
  await db.select({ id: homes.id }).from(homes).where(and(eq(homes.companyId, companyId), refers)).orderBy(asc(homes.id)).for('no key update');
}

export async function lockHome(db: DbOrTx, companyId: string, id: string) {
  // No key update: serialises writers of this home, and lets a sampling plan reference it meanwhile.
  const rows = await db.select({ id: homes.id }).from(homes).where(and(eq(homes.companyId, companyId), eq(homes.id, id))).for('no key update');
  return rows.length > 0;
}

/** What the derived summary of a home is computed from (home-summary.ts). */
export async function summaryInputs(db: DbOrTx, companyId: string, homeId: string) {
  // One after the other: inside a transaction both run on the same connection.
  const visitRows = await db
    .select({ visitedOn: visits.visitedOn, status: visits.status, reworkNeeded: visits.reworkNeeded, reworkDone: visits.reworkDone, vacuumPa: visits.vacuumPa, reworkReasons: visits.reworkReasons })
    .from(visits)
    .where(and(eq(visits.companyId, companyId), eq(visits.homeId, homeId)));
  const testRows = await db
    .select({ kind: radonTests.kind, startedAt: radonTests.startedAt, endedAt: radonTests.endedAt, resultBqM3: radonTests.resultBqM3, sideBySideGroup: radonTests.sideBySideGroup })
    .from(radonTests)
    .where(and(eq(radonTests.companyId, companyId), eq(radonTests.homeId, homeId)));
  return { visitRows, testRows };
}

export async function writeSummary(
  db: DbOrTx,
  companyId: string,
  homeId: string,
  summary: Pick<typeof homes.$inferInsert, 'outcome' | 'lastVacuumPa' | 'lastPostBqM3' | 'reworkFlag' | 'reworkReasons' | 'sampled' | 'failed'>,
) {
  await db
    .update(homes)
    .set({ ...summary, updatedAt: new Date() })
    .where(and(eq(homes.companyId, companyId), eq(homes.id, homeId)));
}

/** True when the home is in its community's latest sampling plan and not yet visited ("sample this home"). */
/**
 * The homes in the latest sampling plan of each of the company's communities: those not yet visited
 * are "planned" (the home panel says so, and the map draws them with the planned symbol).
 */
export const plannedHomeIds = (companyId: string) => sql`select home_id from planned_home_ids(${companyId}::uuid)`;

export async function isPlannedForSampling(db: DbOrTx, companyId: string, homeId: string) {
  const result = await db.execute<{ planned: boolean }>(sql`
    select exists (
      select 1 from homes h
      where h.company_id = ${companyId} and h.id = ${homeId} and h.outcome = 'not_visited' and h.id in (${plannedHomeIds(companyId)})
    ) as planned`);
  return result.rows[0]?.planned === true;
}
