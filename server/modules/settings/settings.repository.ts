import { eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { companies } from '../../db/schema/tables.js';

const settingsColumns = {
  companyName: companies.name,
  actionLevelBqM3: companies.actionLevelBqM3,
  considerLevelBqM3: companies.considerLevelBqM3,
  radonUnit: companies.radonUnit,
  activationPriceCents: companies.activationPriceCents,
  reworkPriceCents: companies.reworkPriceCents,
  quoteConfidence: companies.quoteConfidence,
  pfeTargetPa: companies.pfeTargetPa,
};

export async function getSettings(db: DbOrTx, companyId: string) {
  const [row] = await db.select(settingsColumns).from(companies).where(eq(companies.id, companyId));
  return row;
}

export async function updateSettings(db: DbOrTx, companyId: string, patch: Record<string, unknown>) {
  const { companyName, ...rest } = patch;
  const [row] = await db
    .update(companies)
    .set({ ...rest, ...(companyName !== undefined ? { name: companyName as string } : {}) })
    .where(eq(companies.id, companyId))
    .returning(settingsColumns);
  return row;
}
