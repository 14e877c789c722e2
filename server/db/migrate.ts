import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { fileURLToPath } from 'node:url';
import type { Database } from './client.js';

const migrationsFolder = fileURLToPath(new URL('../../drizzle', import.meta.url));

/** Applies the committed SQL migrations in drizzle/ (idempotent; run at every start). */
export async function runMigrations(database: Database): Promise<void> {
  await migrate(database.db, { migrationsFolder });
}
