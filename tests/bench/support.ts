import { sql } from 'drizzle-orm';
import { createDatabase } from '../../server/db/client.js';
import { runMigrations } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed-demo.js';

/** A fresh bench database with the demo scenario; returns the open handle. */
export async function freshBenchDatabase() {
  const url = process.env.BENCH_DATABASE_URL;
  if (!url) throw new Error('BENCH_DATABASE_URL is not set: run `npm run bench`');
  const database = createDatabase(url, 4);
  await database.db.execute(sql`drop schema if exists drizzle cascade`);
  await database.db.execute(sql`drop schema if exists public cascade`);
  await database.db.execute(sql`create schema public`);
  await runMigrations(database);
  await seedDemo(database);
  return database;
}

export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const idx = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[idx];
}

export function summarise(samplesMs: number[]) {
  const s = [...samplesMs].sort((a, b) => a - b);
  return { n: s.length, p50: percentile(s, 50), p95: percentile(s, 95), max: s[s.length - 1] };
}

export function printTable(title: string, rows: Record<string, string | number>[]) {
  process.stdout.write(`\n${title}\n`);
  console.table(rows);
}

export const fmt = (ms: number) => Math.round(ms * 100) / 100;
