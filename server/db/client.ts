import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as tables from './schema/tables.js';

export type Db = NodePgDatabase<typeof tables>;
/** A database handle or an open transaction: repositories accept either so services can compose writes. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

export interface Database {
  pool: pg.Pool;
  db: Db;
  close(): Promise<void>;
}

export function createDatabase(url: string, max = 10): Database {
  // jit=off: PostgreSQL's JIT compiles any query its planner guesses to be costly, which for the app's
  // short requests (a homes tile: about 3,000 rows) adds 30-40 ms of compiling to a 100 ms query.
  // idleTimeoutMillis: a new connection pays PostGIS's setup on its first tile (about 20 ms for the first
  // ST_AsMVT); keep idle connections five minutes rather than pg's default ten seconds.
  const pool = new pg.Pool({ connectionString: url, max, options: '-c jit=off', idleTimeoutMillis: 5 * 60_000 });
  const db = drizzle(pool, { schema: tables, casing: 'snake_case' });
  return { pool, db, close: () => pool.end() };
}
