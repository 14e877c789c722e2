import type { z } from 'zod';
import type { Db } from '../../db/client.js';
import type { FanBody, FanDto } from '../../../shared/schemas/visits.js';
import { AppError } from '../../lib/errors.js';
import * as repo from './fans.repository.js';

type FanRow = NonNullable<Awaited<ReturnType<typeof repo.findFan>>>;

const toFanDto = (row: FanRow): FanDto => ({ ...row, curve: row.curve as FanDto['curve'] });

/** The curve in order of flow; the maximum static pressure is the curve's highest point (at no or least flow). */
function fanValues(body: z.infer<typeof FanBody>): repo.FanWrite {
  const curve = [...body.curve].sort((a, b) => a.flowCfm - b.flowCfm).map(({ flowCfm, staticInWc }) => ({ flowCfm, staticInWc }));
  return { name: body.name, curve, maxStaticInWc: Math.max(...curve.map((p) => p.staticInWc)) };
}

const nameConflict = () => AppError.conflict('A fan with this name already exists', [{ field: 'name', message: 'is already used by another fan' }]);

export async function listFans(db: Db, companyId: string) {
  return (await repo.listFans(db, companyId)).map(toFanDto);
}

export async function getFan(db: Db, companyId: string, id: string) {
  const row = await repo.findFan(db, companyId, id);
  if (!row) throw AppError.notFound('Fan');
  return toFanDto(row);
}

export async function createFan(db: Db, companyId: string, body: z.infer<typeof FanBody>) {
  if (await repo.nameTaken(db, companyId, body.name)) throw nameConflict();
  const id = await repo.insertFan(db, companyId, fanValues(body));
  return getFan(db, companyId, id);
}

export async function updateFan(db: Db, companyId: string, id: string, body: z.infer<typeof FanBody>) {
  if (!(await repo.findFan(db, companyId, id))) throw AppError.notFound('Fan');
  if (await repo.nameTaken(db, companyId, body.name, id)) throw nameConflict();
  await repo.updateFan(db, companyId, id, fanValues(body));
  return getFan(db, companyId, id);
}
