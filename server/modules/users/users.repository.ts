import { and, asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client.js';
import { companies, users } from '../../db/schema/tables.js';

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
