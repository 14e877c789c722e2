// Vitest global setup: a clean test database with the migrations applied and the demo scenario loaded.
import { sql } from 'drizzle-orm';
import { createDatabase } from '../../server/db/client.js';
import { runMigrations } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed-demo.js';

export default async function resetDatabase() {
  const url = process.env.TEST_DATABASE_URL;
  if (!url) throw new Error('TEST_DATABASE_URL is not set: run the suite with `npm test`');
  const database = createDatabase(url, 2);
  try {
    await database.db.execute(sql`drop schema if exists drizzle cascade`);
    await database.db.execute(sql`drop schema if exists public cascade`);
    await database.db.execute(sql`create schema public`);
    await runMigrations(database);
    await seedDemo(database);
  } finally {
    await database.close();
  }
}
