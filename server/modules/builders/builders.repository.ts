import { and, asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { builders, homes } from '../../db/schema/tables.js';
import { lockHomesReferring } from '../homes/homes.repository.js';

const builderColumns = {
  id: builders.id,
  name: builders.name,
  notes: builders.notes,
  homeCount: sql<number>`(select count(*)::int from ${homes} where ${homes.builderId} = ${builders.id})`,
};

export function listBuilders(db: DbOrTx, companyId: string) {
  return db.select(builderColumns).from(builders).where(eq(builders.companyId, companyId)).orderBy(asc(builders.name));
}

export async function findBuilder(db: DbOrTx, companyId: string, id: string) {
  const [row] = await db
    .select(builderColumns)
    .from(builders)
    .where(and(eq(builders.companyId, companyId), eq(builders.id, id)));
  return row;
}

export async function countBuildersIn(db: DbOrTx, companyId: string, ids: string[]) {
  if (ids.length === 0) return 0;
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(builders)
    .where(and(eq(builders.companyId, companyId), sql`${builders.id} in ${ids}`));
  return row.n;
}

export async function insertBuilder(db: DbOrTx, companyId: string, values: { name: string; notes: string }) {
  const [row] = await db.insert(builders).values({ companyId, ...values }).returning({ id: builders.id });
  return row.id;
}

export async function updateBuilder(db: DbOrTx, companyId: string, id: string, patch: Partial<{ name: string; notes: string }>) {
  const [row] = await db
    .update(builders)
    .set(patch)
    .where(and(eq(builders.companyId, companyId), eq(builders.id, id)))
    .returning({ id: builders.id });
  return row?.id;
}

/** Deletes a builder: its homes lose it (set null), so they are locked first (lockHomesReferring). Call inside a transaction. */
export async function deleteBuilder(db: DbOrTx, companyId: string, id: string) {
  await lockHomesReferring(db, companyId, { builderId: id });
  const rows = await db
    .delete(builders)
    .where(and(eq(builders.companyId, companyId), eq(builders.id, id)))
    .returning({ id: builders.id });
  return rows.length > 0;
}
