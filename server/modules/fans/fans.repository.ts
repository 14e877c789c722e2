import { and, asc, eq, ne, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { fans } from '../../db/schema/tables.js';

const fanColumns = { id: fans.id, name: fans.name, maxStaticInWc: fans.maxStaticInWc, curve: fans.curve };

export function listFans(db: DbOrTx, companyId: string) {
  return db.select(fanColumns).from(fans).where(eq(fans.companyId, companyId)).orderBy(asc(fans.name));
}

export async function findFan(db: DbOrTx, companyId: string, id: string) {
  const [row] = await db.select(fanColumns).from(fans).where(and(eq(fans.companyId, companyId), eq(fans.id, id)));
  return row;
}

/** True when another fan of the company already has this name (names are unique regardless of case). */
export async function nameTaken(db: DbOrTx, companyId: string, name: string, exceptId?: string) {
  const [row] = await db
    .select({ id: fans.id })
    .from(fans)
    .where(and(eq(fans.companyId, companyId), sql`lower(${fans.name}) = lower(${name})`, exceptId ? ne(fans.id, exceptId) : undefined));
  return Boolean(row);
}

export type FanWrite = { name: string; maxStaticInWc: number; curve: { flowCfm: number; staticInWc: number }[] };

export async function insertFan(db: DbOrTx, companyId: string, values: FanWrite) {
  const [row] = await db.insert(fans).values({ companyId, ...values }).returning({ id: fans.id });
  return row.id;
}

export async function updateFan(db: DbOrTx, companyId: string, id: string, values: FanWrite) {
  const [row] = await db
    .update(fans)
    .set(values)
    .where(and(eq(fans.companyId, companyId), eq(fans.id, id)))
    .returning({ id: fans.id });
  return row?.id;
}
