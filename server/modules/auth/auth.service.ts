import type { Db } from '../../db/client.js';
import type { SessionUser } from '../../../shared/schemas/auth.js';
import { verifyPassword } from '../../lib/passwords.js';
import { findSessionUser, findSessionWithUser, findUserForSignIn } from '../users/users.repository.js';

// A real hash of a throwaway password, checked when the e-mail is unknown so that
// response time does not reveal which addresses have accounts.
const DUMMY_HASH =
  'scrypt$32768$8$1$AAAAAAAAAAAAAAAAAAAAAA==$3Fq3m4XxKPpTWb2H1X1G0yPJq0m3mX3v0k3bM2p5x8Q=';

export async function authenticate(db: Db, email: string, password: string): Promise<SessionUser | null> {
  const row = await findUserForSignIn(db, email);
  const ok = await verifyPassword(password, row?.passwordHash ?? DUMMY_HASH);
  if (!row || !ok || !row.active) return null;
  return toSessionUser(row);
}

export async function loadSessionUser(db: Db, id: string): Promise<SessionUser | null> {
  const row = await findSessionUser(db, id);
  if (!row || !row.active) return null;
  return toSessionUser(row);
}

/**
 * A stored session (unexpired) and its signed-in user, read in one statement; the user is null when
 * the session has none, or when that account is gone or deactivated.
 */
export async function readSession(db: Db, sid: string): Promise<{ sess: unknown; user: SessionUser | null } | undefined> {
  const found = await findSessionWithUser(db, sid);
  if (!found) return undefined;
  return { sess: found.sess, user: found.user?.active ? toSessionUser(found.user) : null };
}

function toSessionUser(row: { id: string; email: string; name: string; role: string; companyId: string; companyName: string }): SessionUser {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role as SessionUser['role'],
    companyId: row.companyId,
    companyName: row.companyName,
  };
}
