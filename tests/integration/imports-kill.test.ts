import { randomUUID } from 'node:crypto';
import type { ChildProcess } from 'node:child_process';
import { afterAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { ApiClient } from '../setup/test-app.js';
import { demoUser } from '../setup/demo.js';
import { freePort, startServerProcess, stopServerProcess } from '../setup/server-process.js';
import { startFakeGeocoder } from '../../server/fakes/geocoder.js';
import { uploadCsv, waitForImport } from './imports-support.js';

const ROWS = 60_000;
let child: ChildProcess | undefined;
const geocoder = await startFakeGeocoder(0);
const pool = new pg.Pool({ connectionString: process.env.TEST_DATABASE_URL, max: 2 });
afterAll(async () => {
  if (child) await stopServerProcess(child, 'SIGKILL');
  await geocoder.close();
  await pool.end();
});

/** A large file with coordinates (no geocoding), on invented streets over the demo town. */
function largeCsv(): string {
  const lines = ['Address,City,State,ZIP,Latitude,Longitude,Owner'];
  for (let i = 0; i < ROWS; i++) {
    const lon = -96.64 + ((i * 7919) % 4000) / 100_000;
    const lat = 41.165 + ((i * 104729) % 3000) / 100_000;
    lines.push(`${1 + (i % 5000) * 2} Killdeer Row ${Math.floor(i / 5000) + 1},Tarrowby,ZZ,00090,${lat.toFixed(6)},${lon.toFixed(6)},Owner ${i}`);
  }
  return lines.join('\n') + '\n';
}

async function state(id: string) {
  const batch = await pool.query('select inserted_count from import_batches where id = $1', [id]);
  const homes = await pool.query(`select count(*)::int as n from homes where street like 'Killdeer Row %'`);
  return { batch: batch.rows[0] as { inserted_count: number } | undefined, homes: homes.rows[0].n as number };
}

describe('killing the server during an import', () => {
  it('leaves the batch either absent or complete, never partly written', async () => {
    const port = await freePort();
    const env = { GEOCODER_URL: geocoder.url };
    child = await startServerProcess(port, env);
    const client = new ApiClient(`http://127.0.0.1:${port}`);
    await client.signIn(demoUser('estimator'));

    const id = randomUUID();
    const started = await uploadCsv(client, largeCsv(), { id, fileName: 'large.csv' });
    expect(started.status).toBe(202);
    // Wait until the transaction has written at least one chunk of homes, then kill -9.
    let seen = '';
    for (let i = 0; i < 6000; i++) {
      const job = (await client.get(`/api/imports/${id}`)).body.import;
      seen = `${job.status} ${job.progress.rowsWritten}/${job.progress.rowsToWrite}`;
      if (job.status === 'writing' && job.progress.rowsWritten > 0) break;
      if (job.status === 'committed' || job.status === 'failed') throw new Error(`import finished before the kill: ${seen}`);
      await new Promise((r) => setTimeout(r, 5));
    }
    expect(seen).toMatch(/^writing [1-9]/);
    await stopServerProcess(child, 'SIGKILL');
    child = await startServerProcess(port, env);

    const after = await state(id);
    if (after.batch) expect(after.homes).toBe(after.batch.inserted_count);
    else expect(after.homes).toBe(0);
    // (With one transaction per import the batch is absent: nothing of it was committed.)
    expect(after).toEqual({ batch: undefined, homes: 0 });

    // The same file imports completely after the restart.
    await client.signIn(demoUser('estimator'));
    const again = await uploadCsv(client, largeCsv(), { id, fileName: 'large.csv' });
    expect(again.status).toBe(202);
    const job = await waitForImport(client, id, 120_000);
    expect(job.counts).toMatchObject({ rows: ROWS, inserted: ROWS, rejected: 0 });
    expect(await state(id)).toEqual({ batch: { inserted_count: ROWS }, homes: ROWS });
  }, 240_000);
});
