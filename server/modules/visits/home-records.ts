// A home's visits and radon tests in their API shapes (shared/schemas/visits.ts), for the home
// detail and for the answers of the visit and test endpoints.
import type { Db } from '../../db/client.js';
import type { RadonTestDto, VisitDto } from '../../../shared/schemas/visits.js';
import { checkPostTestTiming, checkTestDuration, type RadonTestInput } from '../../../shared/domain/radon-tests.js';
import * as repo from './visits.repository.js';

type AttachmentRefRow = Awaited<ReturnType<typeof repo.attachmentRefs>>[number];

const refOf = (a: AttachmentRefRow) => ({ id: a.id, kind: a.kind as 'photo' | 'lab_report', subject: a.subject, contentType: a.contentType });

export function toVisitDto(row: repo.VisitRow, attachments: AttachmentRefRow[]): VisitDto {
  return {
    id: row.id,
    homeId: row.homeId,
    visitedOn: row.visitedOn,
    status: row.status as VisitDto['status'],
    technicianName: row.technicianName,
    fanId: row.fanId,
    fanName: row.fanName,
    fanLocation: row.fanLocation,
    fanActivatedAt: row.fanActivatedAt?.toISOString() ?? null,
    vacuumPa: row.vacuumPa,
    laterVacuumPa: row.laterVacuumPa,
    pipeSizeIn: row.pipeSizeIn,
    pipeLengthFt: row.pipeLengthFt,
    elbows: row.elbows,
    pipeEntry: row.pipeEntry,
    subSlabMaterial: row.subSlabMaterial as VisitDto['subSlabMaterial'],
    pressureField: row.pressureField as VisitDto['pressureField'],
    reworkNeeded: row.reworkNeeded,
    reworkDone: row.reworkDone,
    reworkReasons: row.reworkReasons,
    notes: row.notes,
    attachments: attachments.filter((a) => a.visitId === row.id).map(refOf),
  };
}

/**
 * The fan start a test is judged against: the latest one at or before the test's start (a later
 * re-activation after rework does not make an earlier test "too soon"); when the fan was only
 * switched on after the test started, the first such start.
 */
export function activationFor(startedAt: Date, activations: readonly Date[]): Date | null {
  const before = activations.filter((a) => a.getTime() <= startedAt.getTime());
  if (before.length) return before.reduce((a, b) => (b > a ? b : a));
  const after = activations.filter((a) => a.getTime() > startedAt.getTime());
  return after.length ? after.reduce((a, b) => (b < a ? b : a)) : null;
}

/** Practice warnings for a test: its length, and its start against the fan's (never a refusal). */
export function testWarnings(test: RadonTestInput, activations: readonly Date[]): RadonTestDto['warnings'] {
  const warnings = [...checkTestDuration(test)];
  const fanAt = activationFor(new Date(test.startedAt), activations);
  if (fanAt) warnings.push(...checkPostTestTiming(test, fanAt.toISOString()));
  return warnings.map(({ code, message, source }) => ({ code, message, source }));
}

export function toRadonTestDto(row: repo.RadonTestRow, activations: readonly Date[], attachments: AttachmentRefRow[]): RadonTestDto {
  const input: RadonTestInput = {
    kind: row.kind as RadonTestInput['kind'],
    device: row.device as RadonTestInput['device'],
    startedAt: row.startedAt.toISOString(),
    endedAt: row.endedAt.toISOString(),
    resultBqM3: row.resultBqM3,
    sideBySideGroup: row.sideBySideGroup,
  };
  return {
    id: row.id,
    homeId: row.homeId,
    visitId: row.visitId,
    kind: input.kind,
    device: input.device,
    startedAt: input.startedAt,
    endedAt: input.endedAt,
    resultBqM3: row.resultBqM3,
    sideBySideGroup: row.sideBySideGroup,
    warnings: testWarnings(input, activations),
    attachments: attachments.filter((a) => a.radonTestId === row.id).map(refOf),
  };
}

/** Every visit and test of a home, latest first, with their attachments and test warnings. */
export async function homeRecords(db: Db, companyId: string, homeId: string): Promise<{ visits: VisitDto[]; tests: RadonTestDto[] }> {
  const [visits, tests, attachments, activations] = await Promise.all([
    repo.listVisits(db, companyId, homeId),
    repo.listTests(db, companyId, homeId),
    repo.attachmentRefs(db, companyId, { homeId }),
    repo.fanActivations(db, companyId, homeId),
  ]);
  return {
    visits: visits.map((v) => toVisitDto(v, attachments)),
    tests: tests.map((t) => toRadonTestDto(t, activations, attachments)),
  };
}
