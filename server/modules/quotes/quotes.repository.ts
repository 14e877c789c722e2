import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../../db/client.js';
import { homePlaceColumns, streetOrder } from '../homes/homes.repository.js';
import { communities, companies, homes, quotes, visits } from '../../db/schema/tables.js';
import { users } from '../../db/schema/tables.js';

const creator = alias(users, 'creator');
const approver = alias(users, 'approver');

const quoteColumns = {
  id: quotes.id,
  communityId: quotes.communityId,
  communityName: communities.name,
  status: quotes.status,
  homesTotal: quotes.homesTotal,
  homesSampled: quotes.homesSampled,
  failuresSampled: quotes.failuresSampled,
  priorAlpha: quotes.priorAlpha,
  priorBeta: quotes.priorBeta,
  pooled: quotes.pooled,
  confidence: quotes.confidence,
  activationPriceCents: quotes.activationPriceCents,
  reworkPriceCents: quotes.reworkPriceCents,
  expectedReworks: quotes.expectedReworks,
  upperReworks: quotes.upperReworks,
  priceExpectedCents: quotes.priceExpectedCents,
  priceUpperCents: quotes.priceUpperCents,
  recipientEmail: quotes.recipientEmail,
  createdAt: quotes.createdAt,
  createdByName: creator.name,
  approvedAt: quotes.approvedAt,
  approvedByName: approver.name,
  sentAt: quotes.sentAt,
  decidedAt: quotes.decidedAt,
};

function baseQuery(db: DbOrTx) {
  return db
    .select(quoteColumns)
    .from(quotes)
    .innerJoin(communities, eq(communities.id, quotes.communityId))
    .leftJoin(creator, eq(creator.id, quotes.createdBy))
    .leftJoin(approver, eq(approver.id, quotes.approvedBy));
}

export type QuoteRow = Awaited<ReturnType<typeof findQuote>> & {};

export async function findQuote(db: DbOrTx, companyId: string, id: string) {
  const [row] = await baseQuery(db).where(and(eq(quotes.companyId, companyId), eq(quotes.id, id)));
  return row;
}

export function listQuotes(db: DbOrTx, companyId: string, filter: { communityId?: string; status?: string }) {
  return baseQuery(db)
    .where(
      and(
        eq(quotes.companyId, companyId),
        filter.communityId ? eq(quotes.communityId, filter.communityId) : undefined,
        filter.status ? eq(quotes.status, filter.status) : undefined,
      ),
    )
    .orderBy(desc(quotes.createdAt), desc(quotes.id))
    .limit(200);
}

export async function insertQuote(db: DbOrTx, values: typeof quotes.$inferInsert) {
  const [row] = await db.insert(quotes).values(values).returning({ id: quotes.id });
  return row.id;
}

/**
 * Moves a quote from one state to the next only if it is still in the expected state (a
 * compare-and-set, so two people approving at once cannot both succeed).
 */
export async function transition(db: DbOrTx, companyId: string, id: string, from: readonly string[], set: Partial<typeof quotes.$inferInsert>) {
  const rows = await db
    .update(quotes)
    .set(set)
    .where(and(eq(quotes.companyId, companyId), eq(quotes.id, id), sql`${quotes.status} in ${from}`))
    .returning({ id: quotes.id });
  return rows.length > 0;
}

export async function companyName(db: DbOrTx, companyId: string) {
  const [row] = await db.select({ name: companies.name }).from(companies).where(eq(companies.id, companyId));
  return row?.name ?? '';
}

export async function communityOutline(db: DbOrTx, companyId: string, communityId: string) {
  const result = await db.execute<{ name: string; jurisdiction: string; boundary: { type: 'MultiPolygon'; coordinates: number[][][][] } | null }>(sql`
    select name, jurisdiction, ST_AsGeoJSON(boundary, 6)::json as boundary
    from communities where company_id = ${companyId} and id = ${communityId}`);
  return result.rows[0];
}

/** Every home of the community with what the map needs, and what the sampled ones showed. */
export function communityHomes(db: DbOrTx, companyId: string, communityId: string) {
  return db
    .select({
      ...homePlaceColumns,
      yearBuilt: homes.yearBuilt,
      sampled: homes.sampled,
      failed: homes.failed,
      outcome: homes.outcome,
      lastVacuumPa: homes.lastVacuumPa,
      lastPostBqM3: homes.lastPostBqM3,
      // Derived on the home from its completed visits (server/modules/homes/home-summary.ts).
      reworkReasons: homes.reworkReasons,
    })
    .from(homes)
    .where(and(eq(homes.companyId, companyId), eq(homes.communityId, communityId)))
    .orderBy(...streetOrder);
}

/** One home and its latest figures, for the homeowner's results e-mail. */
export async function homeForResults(db: DbOrTx, companyId: string, homeId: string) {
  const [row] = await db
    .select({
      id: homes.id,
      number: homes.number,
      street: homes.street,
      unit: homes.unit,
      city: homes.city,
      state: homes.state,
      zip: homes.zip,
      ownerName: homes.ownerName,
      doNotContact: homes.doNotContact,
      outcome: homes.outcome,
      lastVacuumPa: homes.lastVacuumPa,
      lastPostBqM3: homes.lastPostBqM3,
      lastVisitOn: sql<string | null>`(select max(v.visited_on)::text from ${visits} v where v.home_id = "homes"."id" and v.company_id = ${companyId} and v.status = 'completed')`,
    })
    .from(homes)
    .where(and(eq(homes.companyId, companyId), eq(homes.id, homeId)));
  return row;
}
