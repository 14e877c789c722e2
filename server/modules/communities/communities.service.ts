import type { z } from 'zod';
import type { Db } from '../../db/client.js';
import type { CommunityBody, UpdateCommunityBody } from '../../../shared/schemas/communities.js';
import { AppError } from '../../lib/errors.js';
import { countBuildersIn } from '../builders/builders.repository.js';
import * as repo from './communities.repository.js';

export const listCommunities = (db: Db, companyId: string) => repo.listCommunities(db, companyId);

export async function getCommunity(db: Db, companyId: string, id: string) {
  const row = await repo.findCommunity(db, companyId, id);
  if (!row) throw AppError.notFound('Community');
  return row;
}

async function checkReferences(db: Db, companyId: string, body: z.infer<typeof UpdateCommunityBody>) {
  if (body.boundary && !(await repo.isValidPolygon(db, body.boundary))) {
    throw AppError.unprocessable('The boundary crosses itself or is otherwise not a valid polygon', [
      { field: 'boundary', message: 'not a valid polygon (OGC simple features)' },
    ]);
  }
  const builderIds = body.builderIds ?? [];
  if ((await countBuildersIn(db, companyId, builderIds)) !== new Set(builderIds).size) {
    throw AppError.unprocessable('Unknown builder', [{ field: 'builderIds', message: 'one or more builders do not exist' }]);
  }
}

export async function createCommunity(db: Db, companyId: string, body: z.infer<typeof CommunityBody>) {
  await checkReferences(db, companyId, body);
  const id = await db.transaction(async (tx) => {
    const newId = await repo.insertCommunity(tx, companyId, body);
    await repo.replaceCommunityBuilders(tx, newId, [...new Set(body.builderIds)]);
    return newId;
  });
  return getCommunity(db, companyId, id);
}

export async function updateCommunity(db: Db, companyId: string, id: string, patch: z.infer<typeof UpdateCommunityBody>) {
  await checkReferences(db, companyId, patch);
  const current = await getCommunity(db, companyId, id);
  const yearFrom = patch.yearFrom !== undefined ? patch.yearFrom : current.yearFrom;
  const yearTo = patch.yearTo !== undefined ? patch.yearTo : current.yearTo;
  if (yearFrom != null && yearTo != null && yearFrom > yearTo) {
    throw AppError.unprocessable('Construction years are out of order', [{ field: 'yearTo', message: 'must not be before yearFrom' }]);
  }
  await db.transaction(async (tx) => {
    const { builderIds, ...values } = patch;
    await repo.updateCommunity(tx, companyId, id, values);
    if (builderIds) await repo.replaceCommunityBuilders(tx, id, [...new Set(builderIds)]);
  });
  return getCommunity(db, companyId, id);
}

export async function deleteCommunity(db: Db, companyId: string, id: string) {
  if (!(await db.transaction((tx) => repo.deleteCommunity(tx, companyId, id)))) throw AppError.notFound('Community');
}
