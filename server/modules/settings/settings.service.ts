import type { z } from 'zod';
import type { Db } from '../../db/client.js';
import type { SettingsDto, UpdateSettingsBody } from '../../../shared/schemas/settings.js';
import { AppError } from '../../lib/errors.js';
import * as repo from './settings.repository.js';

export async function getSettings(db: Db, companyId: string): Promise<SettingsDto> {
  const row = await repo.getSettings(db, companyId);
  if (!row) throw AppError.notFound('Company');
  return row as SettingsDto;
}

export async function updateSettings(db: Db, companyId: string, patch: z.infer<typeof UpdateSettingsBody>) {
  const current = await getSettings(db, companyId);
  const action = patch.actionLevelBqM3 ?? current.actionLevelBqM3;
  const consider = patch.considerLevelBqM3 ?? current.considerLevelBqM3;
  if (consider > action) {
    throw AppError.unprocessable('The "consider fixing" level must not exceed the action level', [
      { field: 'considerLevelBqM3', message: 'must be at or below the action level' },
    ]);
  }
  return (await repo.updateSettings(db, companyId, patch)) as SettingsDto;
}
