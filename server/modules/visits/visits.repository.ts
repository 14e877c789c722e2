import { and, asc, desc, eq, isNotNull } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { attachments, fans, radonTests, users, visits } from '../../db/schema/tables.js';

const visitColumns = {
  id: visits.id,
  companyId: visits.companyId,
  homeId: visits.homeId,
  visitedOn: visits.visitedOn,
  status: visits.status,
  technicianName: users.name,
  fanId: visits.fanId,
  fanName: fans.name,
  fanLocation: visits.fanLocation,
  fanActivatedAt: visits.fanActivatedAt,
  vacuumPa: visits.vacuumPa,
  laterVacuumPa: visits.laterVacuumPa,
  pipeSizeIn: visits.pipeSizeIn,
  pipeLengthFt: visits.pipeLengthFt,
  elbows: visits.elbows,
  pipeEntry: visits.pipeEntry,
  subSlabMaterial: visits.subSlabMaterial,
  pressureField: visits.pressureField,
  reworkNeeded: visits.reworkNeeded,
  reworkDone: visits.reworkDone,
  reworkReasons: visits.reworkReasons,
  notes: visits.notes,
};
export type VisitRow = Awaited<ReturnType<typeof listVisits>>[number];

function visitQuery(db: DbOrTx) {
  return db
    .select(visitColumns)
    .from(visits)
    .leftJoin(users, eq(users.id, visits.technicianId))
    .leftJoin(fans, eq(fans.id, visits.fanId));
}

/** A home's visits, latest first. */
export function listVisits(db: DbOrTx, companyId: string, homeId: string) {
  return visitQuery(db)
    .where(and(eq(visits.companyId, companyId), eq(visits.homeId, homeId)))
    .orderBy(desc(visits.visitedOn), desc(visits.createdAt));
}

export async function findVisit(db: DbOrTx, companyId: string, id: string) {
  const [row] = await visitQuery(db).where(and(eq(visits.companyId, companyId), eq(visits.id, id)));
  return row;
}

/** Where an id is already used, whatever the company (client-generated ids must not be taken twice). */
export async function visitOwner(db: DbOrTx, id: string) {
  const [row] = await db.select({ companyId: visits.companyId, homeId: visits.homeId }).from(visits).where(eq(visits.id, id));
  return row;
}

export async function insertVisit(db: DbOrTx, values: typeof visits.$inferInsert): Promise<boolean> {
  const rows = await db.insert(visits).values(values).onConflictDoNothing({ target: visits.id }).returning({ id: visits.id });
  return rows.length > 0;
}

/** True when the visit belongs to this home of this company. */
export async function visitOfHome(db: DbOrTx, companyId: string, homeId: string, visitId: string) {
  const [row] = await db
    .select({ id: visits.id })
    .from(visits)
    .where(and(eq(visits.companyId, companyId), eq(visits.homeId, homeId), eq(visits.id, visitId)));
  return Boolean(row);
}

/** The times the home's fans were switched on, oldest first (for the post-test timing check). */
export async function fanActivations(db: DbOrTx, companyId: string, homeId: string): Promise<Date[]> {
  const rows = await db
    .select({ at: visits.fanActivatedAt })
    .from(visits)
    .where(and(eq(visits.companyId, companyId), eq(visits.homeId, homeId), isNotNull(visits.fanActivatedAt)))
    .orderBy(asc(visits.fanActivatedAt));
  return rows.map((r) => r.at!);
}

export async function fanBelongs(db: DbOrTx, companyId: string, fanId: string) {
  const [row] = await db.select({ id: fans.id }).from(fans).where(and(eq(fans.companyId, companyId), eq(fans.id, fanId)));
  return Boolean(row);
}

// ── Radon tests ───────────────────────────────────────────────────────────────────────────────────

const testColumns = {
  id: radonTests.id,
  companyId: radonTests.companyId,
  homeId: radonTests.homeId,
  visitId: radonTests.visitId,
  kind: radonTests.kind,
  device: radonTests.device,
  startedAt: radonTests.startedAt,
  endedAt: radonTests.endedAt,
  resultBqM3: radonTests.resultBqM3,
  sideBySideGroup: radonTests.sideBySideGroup,
};
export type RadonTestRow = Awaited<ReturnType<typeof listTests>>[number];

/** A home's radon tests, latest end first. */
export function listTests(db: DbOrTx, companyId: string, homeId: string) {
  return db
    .select(testColumns)
    .from(radonTests)
    .where(and(eq(radonTests.companyId, companyId), eq(radonTests.homeId, homeId)))
    .orderBy(desc(radonTests.endedAt), desc(radonTests.startedAt));
}

export async function findTest(db: DbOrTx, companyId: string, id: string) {
  const [row] = await db.select(testColumns).from(radonTests).where(and(eq(radonTests.companyId, companyId), eq(radonTests.id, id)));
  return row;
}

export async function testOwner(db: DbOrTx, id: string) {
  const [row] = await db.select({ companyId: radonTests.companyId, homeId: radonTests.homeId }).from(radonTests).where(eq(radonTests.id, id));
  return row;
}

export async function insertTest(db: DbOrTx, values: typeof radonTests.$inferInsert): Promise<boolean> {
  const rows = await db.insert(radonTests).values(values).onConflictDoNothing({ target: radonTests.id }).returning({ id: radonTests.id });
  return rows.length > 0;
}

export async function testOfHome(db: DbOrTx, companyId: string, homeId: string, testId: string) {
  const [row] = await db
    .select({ id: radonTests.id })
    .from(radonTests)
    .where(and(eq(radonTests.companyId, companyId), eq(radonTests.homeId, homeId), eq(radonTests.id, testId)));
  return Boolean(row);
}

// ── Attachments as visits and tests list them ────────────────────────────────────────────────────

/** Attachments of a home, of one visit or of one test, oldest first. */
export function attachmentRefs(db: DbOrTx, companyId: string, of: { homeId: string } | { visitId: string } | { radonTestId: string }) {
  const where =
    'homeId' in of ? eq(attachments.homeId, of.homeId) : 'visitId' in of ? eq(attachments.visitId, of.visitId) : eq(attachments.radonTestId, of.radonTestId);
  return db
    .select({
      id: attachments.id,
      kind: attachments.kind,
      subject: attachments.subject,
      contentType: attachments.contentType,
      visitId: attachments.visitId,
      radonTestId: attachments.radonTestId,
    })
    .from(attachments)
    .where(and(eq(attachments.companyId, companyId), where))
    .orderBy(asc(attachments.createdAt), asc(attachments.id));
}
