import type { z } from 'zod';
import type { Db } from '../../db/client.js';
import type { BuilderBody, UpdateBuilderBody } from '../../../shared/schemas/builders.js';
import { AppError } from '../../lib/errors.js';
import * as repo from './builders.repository.js';

export const listBuilders = (db: Db, companyId: string) => repo.listBuilders(db, companyId);

export async function getBuilder(db: Db, companyId: string, id: string) {
  const row = await repo.findBuilder(db, companyId, id);
  if (!row) throw AppError.notFound('Builder');
  return row;
}

export async function createBuilder(db: Db, companyId: string, body: z.infer<typeof BuilderBody>) {
  const id = await repo.insertBuilder(db, companyId, body);
  return getBuilder(db, companyId, id);
}

export async function updateBuilder(db: Db, companyId: string, id: string, patch: z.infer<typeof UpdateBuilderBody>) {
  const updated = await repo.updateBuilder(db, companyId, id, patch);
  if (!updated) throw AppError.notFound('Builder');
  return getBuilder(db, companyId, id);
}

export async function deleteBuilder(db: Db, companyId: string, id: string) {
  if (!(await db.transaction((tx) => repo.deleteBuilder(tx, companyId, id)))) throw AppError.notFound('Builder');
}
