import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as tables from './schema/tables.js';

export type Db = NodePgDatabase<typeof tables>;
/** A database handle or an open transaction: repositories accept either so services can compose writes. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

export interface Database {
  pool: pg.Pool;
  db: Db;
  /**
   * A few connections for homes tiles, set up for them: a tile is a few thousand rows, where starting
   * parallel workers costs more than it saves, and a dense filtered overview tile hashes its cells in
   * memory. Settings per connection spare each tile a transaction of three more round trips.
   */
  tiles: Db;
  /** How many connections `tiles` opens at most. */
  tileConnections: number;
  close(): Promise<void>;
}

export function createDatabase(url: string, max = 10): Database {
  // jit=off: PostgreSQL's JIT compiles any query its planner guesses to be costly, which for the app's
  // short requests (a homes tile: about 3,000 rows) adds 30-40 ms of compiling to a 100 ms query.
  // idleTimeoutMillis: a new connection pays PostGIS's setup on its first tile (about 20 ms for the first
  // ST_AsMVT); keep idle connections five minutes rather than pg's default ten seconds.
  const pool = new pg.Pool({ connectionString: url, max, options: '-c jit=off', idleTimeoutMillis: 5 * 60_000 });
  const db = drizzle(pool, { schema: tables, casing: 'snake_case' });
  const tileConnections = Math.min(4, max);
  const tilePool = new pg.Pool({
    connectionString: url,
    max: tileConnections,
    options: '-c jit=off -c max_parallel_workers_per_gather=0 -c work_mem=32MB',
    idleTimeoutMillis: 5 * 60_000,
  });
  const tiles = drizzle(tilePool, { schema: tables, casing: 'snake_case' });
  return { pool, db, tiles, tileConnections, close: async () => void (await Promise.all([pool.end(), tilePool.end()])) };
}
