import type { Db } from '../../db/client.js';
import type { SessionUser } from '../../../shared/schemas/auth.js';
import type { HomeDto } from '../../../shared/schemas/homes.js';
import type { RadonTestBody, RadonTestDto, VisitBody, VisitDto } from '../../../shared/schemas/visits.js';
import { inWcToPa, pciLToBqM3 } from '../../../shared/domain/units.js';
import { AppError } from '../../lib/errors.js';
import { getHome, refreshHomeSummary } from '../homes/homes.service.js';
import { lockHome } from '../homes/homes.repository.js';
import { toRadonTestDto, toVisitDto } from './home-records.js';
import * as repo from './visits.repository.js';

type Viewer = Pick<SessionUser, 'id' | 'companyId' | 'role'>;

/** Why a client-generated id cannot be stored: it is already used by another home or company. */
const idTaken = (what: string) =>
  AppError.conflict(`This ${what} id is already used by another record`, [{ field: 'id', message: 'is already used; generate a new id' }]);

const toPa = (inWc: number | null) => (inWc === null ? null : inWcToPa(inWc));

/**
 * Stores a visit recorded on a device and re-derives the home's outcome in the same transaction.
 * The id comes from the device: a retry of a visit already stored for this home changes nothing
 * and answers as the first time did (`created: false`).
 */
export async function recordVisit(
  db: Db,
  viewer: Viewer,
  homeId: string,
  body: VisitBody,
): Promise<{ created: boolean; visit: VisitDto; home: HomeDto }> {
  const created = await db.transaction(async (tx) => {
    if (!(await lockHome(tx, viewer.companyId, homeId))) throw AppError.notFound('Home');
    const owner = await repo.visitOwner(tx, body.id);
    if (owner) {
      if (owner.companyId === viewer.companyId && owner.homeId === homeId) return false;
      throw idTaken('visit');
    }
    if (body.fanId !== null && !(await repo.fanBelongs(tx, viewer.companyId, body.fanId))) {
      throw new AppError('VALIDATION_FAILED', 400, 'Invalid body: fanId', [{ field: 'fanId', message: 'no such fan in your company' }]);
    }
    const inserted = await repo.insertVisit(tx, {
      id: body.id,
      companyId: viewer.companyId,
      homeId,
      technicianId: viewer.id,
      visitedOn: body.visitedOn,
      status: body.status,
      fanId: body.fanId,
      fanLocation: body.fanLocation,
      fanActivatedAt: body.fanActivatedAt === null ? null : new Date(body.fanActivatedAt),
      // Entered in in. WC as the manometer reads; stored in Pa (NIST SP 811 B.8, conventional inch of water).
      vacuumPa: toPa(body.vacuumInWc),
      laterVacuumPa: toPa(body.laterVacuumInWc),
      pipeSizeIn: body.pipeSizeIn,
      pipeLengthFt: body.pipeLengthFt,
      elbows: body.elbows,
      pipeEntry: body.pipeEntry,
      subSlabMaterial: body.subSlabMaterial,
      pressureField: body.pressureField.map((h) => ({
        distanceFt: h.distanceFt,
        differentialPa: h.unit === 'Pa' ? h.differential : inWcToPa(h.differential),
      })),
      reworkNeeded: body.reworkNeeded,
      reworkDone: body.reworkDone,
      reworkReasons: body.reworkReasons,
      notes: body.notes,
    });
    if (!inserted) {
      // The same id arrived twice at once: the other request stored it first.
      const winner = await repo.visitOwner(tx, body.id);
      if (winner?.companyId === viewer.companyId && winner.homeId === homeId) return false;
      throw idTaken('visit');
    }
    await refreshHomeSummary(tx, viewer.companyId, homeId);
    return true;
  });
  const [row, attachments, home] = await Promise.all([
    repo.findVisit(db, viewer.companyId, body.id),
    repo.attachmentRefs(db, viewer.companyId, { visitId: body.id }),
    getHome(db, viewer, homeId),
  ]);
  return { created, visit: toVisitDto(row!, attachments), home };
}

/**
 * Stores a radon test (result converted to Bq/m³, the stored unit) and re-derives the home's
 * outcome in the same transaction. Practice problems (too short, too soon after the fan) come back
 * as warnings: the result is stored all the same.
 */
export async function recordRadonTest(db: Db, viewer: Viewer, homeId: string, body: RadonTestBody): Promise<{ created: boolean; test: RadonTestDto }> {
  const created = await db.transaction(async (tx) => {
    if (!(await lockHome(tx, viewer.companyId, homeId))) throw AppError.notFound('Home');
    const owner = await repo.testOwner(tx, body.id);
    if (owner) {
      if (owner.companyId === viewer.companyId && owner.homeId === homeId) return false;
      throw idTaken('radon test');
    }
    if (body.visitId !== null && !(await repo.visitOfHome(tx, viewer.companyId, homeId, body.visitId))) {
      throw new AppError('VALIDATION_FAILED', 400, 'Invalid body: visitId', [{ field: 'visitId', message: 'no such visit at this home' }]);
    }
    const inserted = await repo.insertTest(tx, {
      id: body.id,
      companyId: viewer.companyId,
      homeId,
      visitId: body.visitId,
      kind: body.kind,
      device: body.device,
      startedAt: new Date(body.startedAt),
      endedAt: new Date(body.endedAt),
      // Stored exactly in Bq/m³: 1 pCi/L = 37 Bq/m³ by the definition of the curie (ANSI/AARST MAH-2019 §7.1).
      resultBqM3: body.unit === 'pCi/L' ? pciLToBqM3(body.result) : body.result,
      sideBySideGroup: body.sideBySideGroup,
    });
    if (!inserted) {
      const winner = await repo.testOwner(tx, body.id);
      if (winner?.companyId === viewer.companyId && winner.homeId === homeId) return false;
      throw idTaken('radon test');
    }
    await refreshHomeSummary(tx, viewer.companyId, homeId);
    return true;
  });
  const [row, activations, attachments] = await Promise.all([
    repo.findTest(db, viewer.companyId, body.id),
    repo.fanActivations(db, viewer.companyId, homeId),
    repo.attachmentRefs(db, viewer.companyId, { radonTestId: body.id }),
  ]);
  return { created, test: toRadonTestDto(row!, activations, attachments) };
}
