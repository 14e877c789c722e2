import type { z } from 'zod';
import type { Db } from '../../db/client.js';
import type { CreateUserBody, UpdateUserBody, UserDto } from '../../../shared/schemas/users.js';
import { AppError } from '../../lib/errors.js';
import { hashPassword } from '../../lib/passwords.js';
import * as repo from './users.repository.js';

type UserRow = Awaited<ReturnType<typeof repo.listUsers>>[number];
const toDto = (u: UserRow): UserDto => ({ ...u, role: u.role as UserDto['role'], createdAt: u.createdAt.toISOString() });

export async function listUsers(db: Db, companyId: string) {
  return (await repo.listUsers(db, companyId)).map(toDto);
}

export async function createUser(db: Db, companyId: string, body: z.infer<typeof CreateUserBody>) {
  const existing = await repo.findUserForSignIn(db, body.email);
  if (existing) throw AppError.conflict('That e-mail already has an account', [{ field: 'email', message: 'already in use' }]);
  const passwordHash = await hashPassword(body.password);
  return toDto(await repo.insertUser(db, { companyId, email: body.email, name: body.name, role: body.role, passwordHash }));
}

export async function updateUser(
  db: Db,
  companyId: string,
  actingUserId: string,
  id: string,
  patch: z.infer<typeof UpdateUserBody>,
) {
  // An admin demoting or deactivating themself could lock the company out of its own settings.
  if (id === actingUserId && ((patch.role && patch.role !== 'admin') || patch.active === false)) {
    throw AppError.unprocessable('You cannot remove your own admin access', [{ field: 'role', message: 'ask another admin' }]);
  }
  const row = await repo.updateUser(db, companyId, id, patch);
  if (!row) throw AppError.notFound('User');
  return toDto(row);
}
