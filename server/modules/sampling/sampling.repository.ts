import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { homePlaceColumns, streetOrder } from '../homes/homes.repository.js';
import { communities, homes, samplingPlanHomes, samplingPlans, users } from '../../db/schema/tables.js';

/** Homes, sampled homes and failures of one community, from the derived flags on each home. */
export async function communityCounts(db: DbOrTx, companyId: string, communityId: string) {
  const [row] = await db
    .select({
      name: communities.name,
      homesTotal: sql<number>`(select count(*)::int from ${homes} h where h.company_id = ${companyId} and h.community_id = ${communityId})`,
      sampled: sql<number>`(select count(*)::int from ${homes} h where h.company_id = ${companyId} and h.community_id = ${communityId} and h.sampled)`,
      failures: sql<number>`(select count(*)::int from ${homes} h where h.company_id = ${companyId} and h.community_id = ${communityId} and h.sampled and h.failed)`,
    })
    .from(communities)
    .where(and(eq(communities.companyId, companyId), eq(communities.id, communityId)));
  return row;
}

/** Homes that may still be sampled: not yet sampled, not declined, and not marked do-not-contact. */
export function candidateHomes(db: DbOrTx, companyId: string, communityId: string) {
  return db
    .select({
      id: homes.id,
      street: homes.street,
      lon: sql<number>`ST_X(${homes.location})`,
      lat: sql<number>`ST_Y(${homes.location})`,
      doNotContact: homes.doNotContact,
    })
    .from(homes)
    .where(
      and(
        eq(homes.companyId, companyId),
        eq(homes.communityId, communityId),
        eq(homes.sampled, false),
        eq(homes.doNotContact, false),
        sql`${homes.outcome} <> 'declined'`,
      ),
    );
}

/**
 * Writes a plan and its homes. The homes are locked (key share, as their foreign key would) before the
 * plan: the plan's triggers take the company's map lock, and a visit, an import or a delete holding one
 * of these homes asks for that lock after its row, so waiting on a home while holding it would deadlock
 * (DEVELOPERS.md, "Locks"). A home deleted meanwhile is left out.
 */
export async function insertPlan(
  db: DbOrTx,
  values: { companyId: string; communityId: string; marginOfError: number; expectedRate: number; sampleSize: number; createdBy: string },
  homeIds: string[],
) {
  const live = homeIds.length
    ? await db.select({ id: homes.id }).from(homes).where(and(eq(homes.companyId, values.companyId), inArray(homes.id, homeIds))).orderBy(asc(homes.id)).for('key share')
    : [];
  const [row] = await db.insert(samplingPlans).values(values).returning({ id: samplingPlans.id });
  if (live.length) await db.insert(samplingPlanHomes).values(live.map((h) => ({ planId: row.id, homeId: h.id })));
  return row.id;
}

const planColumns = {
  id: samplingPlans.id,
  communityId: samplingPlans.communityId,
  communityName: communities.name,
  marginOfError: samplingPlans.marginOfError,
  expectedRate: samplingPlans.expectedRate,
  sampleSize: samplingPlans.sampleSize,
  createdAt: samplingPlans.createdAt,
  createdByName: users.name,
};

export function listPlans(db: DbOrTx, companyId: string, communityId?: string) {
  return db
    .select(planColumns)
    .from(samplingPlans)
    .innerJoin(communities, eq(communities.id, samplingPlans.communityId))
    .leftJoin(users, eq(users.id, samplingPlans.createdBy))
    .where(and(eq(samplingPlans.companyId, companyId), communityId ? eq(samplingPlans.communityId, communityId) : undefined))
    .orderBy(desc(samplingPlans.createdAt), desc(samplingPlans.id))
    .limit(100);
}

export async function findPlan(db: DbOrTx, companyId: string, id: string) {
  const [row] = await db
    .select(planColumns)
    .from(samplingPlans)
    .innerJoin(communities, eq(communities.id, samplingPlans.communityId))
    .leftJoin(users, eq(users.id, samplingPlans.createdBy))
    .where(and(eq(samplingPlans.companyId, companyId), eq(samplingPlans.id, id)));
  return row;
}

export function planHomes(db: DbOrTx, companyId: string, planId: string) {
  return db
    .select({
      ...homePlaceColumns,
      outcome: homes.outcome,
      sampled: homes.sampled,
    })
    .from(samplingPlanHomes)
    .innerJoin(homes, eq(homes.id, samplingPlanHomes.homeId))
    .where(and(eq(samplingPlanHomes.planId, planId), eq(homes.companyId, companyId)))
    .orderBy(...streetOrder);
}
