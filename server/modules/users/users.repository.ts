import { and, asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { companies, session, users } from '../../db/schema/tables.js';

const userColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  active: users.active,
  createdAt: users.createdAt,
};

export async function findUserForSignIn(db: DbOrTx, email: string) {
  const [row] = await db
    .select({ ...userColumns, companyId: users.companyId, companyName: companies.name, passwordHash: users.passwordHash })
    .from(users)
    .innerJoin(companies, eq(companies.id, users.companyId))
    .where(sql`lower(${users.email}) = ${email.toLowerCase()}`);
  return row;
}

export async function findSessionUser(db: DbOrTx, id: string) {
  const [row] = await db
    .select({ ...userColumns, companyId: users.companyId, companyName: companies.name })
    .from(users)
    .innerJoin(companies, eq(companies.id, users.companyId))
    .where(eq(users.id, id));
  return row;
}

/**
 * A stored session that has not expired, and the user it signed in (read in the same statement, so
 * a request needs one round trip for both). `user` is undefined when the session has no signed-in
 * user or that user is gone.
 */
export async function findSessionWithUser(db: DbOrTx, sid: string) {
  // The user id as the session keeps it (passport's `passport.user`); anything but a uuid matches no one.
  const userId = sql`case when ${session.sess} #>> '{passport,user}' ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$'
    then (${session.sess} #>> '{passport,user}')::uuid end`;
  const [row] = await db
    .select({ sess: session.sess, ...userColumns, companyId: users.companyId, companyName: companies.name })
    .from(session)
    .leftJoin(users, eq(users.id, userId))
    .leftJoin(companies, eq(companies.id, users.companyId))
    .where(and(eq(session.sid, sid), sql`${session.expire} >= now()`));
  if (!row) return undefined;
  const { sess, id, companyId, companyName, ...rest } = row;
  // Left joined, so every user column is nullable to the type checker; with an id they are all there.
  type SessionUserRow = NonNullable<Awaited<ReturnType<typeof findSessionUser>>>;
  return { sess, user: id && companyId && companyName != null ? ({ id, companyId, companyName, ...rest } as SessionUserRow) : undefined };
}

export function listUsers(db: DbOrTx, companyId: string) {
  return db.select(userColumns).from(users).where(eq(users.companyId, companyId)).orderBy(asc(users.name));
}

export async function insertUser(
  db: DbOrTx,
  values: { companyId: string; email: string; name: string; role: string; passwordHash: string },
) {
  const [row] = await db.insert(users).values(values).returning(userColumns);
  return row;
}

export async function updateUser(
  db: DbOrTx,
  companyId: string,
  id: string,
  patch: Partial<{ name: string; role: string; active: boolean }>,
) {
  const [row] = await db
    .update(users)
    .set(patch)
    .where(and(eq(users.companyId, companyId), eq(users.id, id)))
    .returning(userColumns);
  return row;
}
