import { and, eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { attachments, homes, radonTests } from '../../db/schema/tables.js';

const attachmentColumns = {
  id: attachments.id,
  companyId: attachments.companyId,
  homeId: attachments.homeId,
  kind: attachments.kind,
  subject: attachments.subject,
  contentType: attachments.contentType,
  byteSize: attachments.byteSize,
  storageKey: attachments.storageKey,
  thumbnailKey: attachments.thumbnailKey,
  originalName: attachments.originalName,
};
export type AttachmentRow = NonNullable<Awaited<ReturnType<typeof findAttachment>>>;

export async function findAttachment(db: DbOrTx, companyId: string, id: string) {
  const [row] = await db.select(attachmentColumns).from(attachments).where(and(eq(attachments.companyId, companyId), eq(attachments.id, id)));
  return row;
}

/** The attachment with this id, whatever its company (client-generated ids must not be taken twice). */
export async function findAttachmentAnyCompany(db: DbOrTx, id: string) {
  const [row] = await db.select(attachmentColumns).from(attachments).where(eq(attachments.id, id));
  return row;
}

export async function insertAttachment(db: DbOrTx, values: typeof attachments.$inferInsert): Promise<boolean> {
  const rows = await db.insert(attachments).values(values).onConflictDoNothing({ target: attachments.id }).returning({ id: attachments.id });
  return rows.length > 0;
}

export async function homeExists(db: DbOrTx, companyId: string, homeId: string) {
  const [row] = await db.select({ id: homes.id }).from(homes).where(and(eq(homes.companyId, companyId), eq(homes.id, homeId)));
  return Boolean(row);
}

/** True when the visit belongs to this home of this company (shared with the visits module). */
export { visitOfHome } from '../visits/visits.repository.js';

export async function testOfHome(db: DbOrTx, companyId: string, homeId: string, testId: string) {
  const [row] = await db
    .select({ id: radonTests.id })
    .from(radonTests)
    .where(and(eq(radonTests.companyId, companyId), eq(radonTests.homeId, homeId), eq(radonTests.id, testId)));
  return Boolean(row);
}
