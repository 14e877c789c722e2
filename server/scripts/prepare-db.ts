// Applies migrations and loads the demo scenario into an empty database (npm start / npm test).
import { env } from '../config/env.js';
import { createDatabase } from '../db/client.js';
import { runMigrations } from '../db/migrate.js';
import { seedDemo } from '../db/seed-demo.js';

const database = createDatabase(env().DATABASE_URL, 2);
try {
  await runMigrations(database);
  const seeded = await seedDemo(database);
  process.stdout.write(seeded ? '[tractwise] demo scenario loaded\n' : '[tractwise] database already has data; demo not reloaded\n');
} finally {
  await database.close();
}
