import type { z } from 'zod';
import type { Db, DbOrTx } from '../../db/client.js';
import type { HomeBody, HomeDto, HomeListQuery, UpdateHomeBody } from '../../../shared/schemas/homes.js';
import { CONTACT_ROLES, type Role } from '../../../shared/schemas/enums.js';
import { addressKey, formatAddress } from '../../../shared/domain/address.js';
import { AppError, type FieldError } from '../../lib/errors.js';
import type { OutcomeTest, OutcomeVisit } from '../../../shared/domain/outcome.js';
import * as repo from './homes.repository.js';
import { summariseHome } from './home-summary.js';
import { getSettings } from '../settings/settings.repository.js';
import { homeRecords } from '../visits/home-records.js';

type Viewer = { companyId: string; role: Role };

export function toHomeDto(row: NonNullable<Awaited<ReturnType<typeof repo.findHome>>>, role: Role): HomeDto {
  const { ownerName, mailingAddress, ...rest } = row;
  return {
    ...rest,
    address: formatAddress(row),
    foundation: row.foundation as HomeDto['foundation'],
    passiveSystem: row.passiveSystem as HomeDto['passiveSystem'],
    outcome: row.outcome as HomeDto['outcome'],
    contact: CONTACT_ROLES.includes(role) ? { ownerName, mailingAddress } : null,
  };
}

export async function listHomes(db: Db, viewer: Viewer, query: z.infer<typeof HomeListQuery>) {
  const { rows, total } = await repo.listHomes(db, viewer.companyId, query);
  return { homes: rows.map((r) => toHomeDto(r, viewer.role)), total };
}

export async function getHome(db: Db, viewer: Viewer, id: string) {
  const row = await repo.findHome(db, viewer.companyId, id);
  if (!row) throw AppError.notFound('Home');
  return toHomeDto(row, viewer.role);
}

export async function getHomeDetail(db: Db, viewer: Viewer, id: string) {
  const home = await getHome(db, viewer, id);
  const [{ visits, tests }, planned] = await Promise.all([
    homeRecords(db, viewer.companyId, id),
    repo.isPlannedForSampling(db, viewer.companyId, id),
  ]);
  return { home, visits, tests, planned };
}

/** A home's detail by its short number: what a tap on the map asks for. */
export async function getHomeDetailByRef(db: Db, viewer: Viewer, ref: number) {
  const id = await repo.findHomeIdByRef(db, viewer.companyId, ref);
  if (!id) throw AppError.notFound('Home');
  return getHomeDetail(db, viewer, id);
}

/**
 * Recomputes a home's derived outcome and summary from all its visits and tests, with the
 * company's action level, and stores it on the home. Call inside the transaction that changed
 * them, after repo.lockHome, so the stored summary always matches the records.
 */
export async function refreshHomeSummary(tx: DbOrTx, companyId: string, homeId: string) {
  const { visitRows, testRows } = await repo.summaryInputs(tx, companyId, homeId);
  const settings = await getSettings(tx, companyId);
  const summary = summariseHome(
    visitRows.map((v) => ({ ...v, status: v.status as OutcomeVisit['status'] })),
    testRows.map((t): OutcomeTest => ({
      kind: t.kind as OutcomeTest['kind'],
      startedAt: t.startedAt.toISOString(),
      endedAt: t.endedAt.toISOString(),
      resultBqM3: t.resultBqM3,
      sideBySideGroup: t.sideBySideGroup,
    })),
    settings.actionLevelBqM3,
  );
  await repo.writeSummary(tx, companyId, homeId, summary);
  return summary;
}

async function checkReferences(db: Db, companyId: string, body: { communityId?: string | null; builderId?: string | null }) {
  const fields: FieldError[] = [];
  if (body.communityId && !(await repo.referenceBelongs(db, companyId, 'communities', body.communityId))) {
    fields.push({ field: 'communityId', message: 'no such community' });
  }
  if (body.builderId && !(await repo.referenceBelongs(db, companyId, 'builders', body.builderId))) {
    fields.push({ field: 'builderId', message: 'no such builder' });
  }
  if (fields.length) throw AppError.unprocessable('Unknown community or builder', fields);
}

export async function createHome(db: Db, viewer: Viewer, body: z.infer<typeof HomeBody>) {
  await checkReferences(db, viewer.companyId, body);
  // A home placed inside a community's boundary belongs to it unless the request says otherwise.
  const communityId = body.communityId ?? (await repo.communityAt(db, viewer.companyId, body.lon, body.lat));
  const id = await repo.insertHome(db, viewer.companyId, { ...body, communityId, addressKey: addressKey(body) });
  return getHome(db, viewer, id);
}

export async function updateHome(db: Db, viewer: Viewer, id: string, patch: z.infer<typeof UpdateHomeBody>) {
  await checkReferences(db, viewer.companyId, patch);
  const current = await repo.findHome(db, viewer.companyId, id);
  if (!current) throw AppError.notFound('Home');
  if ((patch.lon === undefined) !== (patch.lat === undefined)) {
    throw AppError.unprocessable('Move a home with both coordinates', [{ field: patch.lon === undefined ? 'lon' : 'lat', message: 'required with the other coordinate' }]);
  }
  const merged = { ...current, ...patch };
  await repo.updateHome(db, viewer.companyId, id, { ...patch, addressKey: addressKey(merged) });
  return getHome(db, viewer, id);
}

export async function deleteHome(db: Db, viewer: Viewer, id: string) {
  if (!(await repo.deleteHome(db, viewer.companyId, id))) throw AppError.notFound('Home');
}
