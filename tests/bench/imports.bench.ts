// Address import throughput (issue: bulk address import). Two files, each timed end to end through the real
// server process (upload, parse, validate, geocode, assign communities, write in one transaction), printed
// beside PostgreSQL's own COPY of the same rows into a plain scratch table in the same run.
// Target: import rows/s ≥ 25% of COPY rows/s.
import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { from as copyFrom } from 'pg-copy-streams';
import { freePort, startServerProcess, stopServerProcess } from '../setup/server-process.js';
import { ApiClient } from '../setup/test-app.js';
import { startFakeGeocoder } from '../../server/fakes/geocoder.js';
import { uploadCsv, waitForImport } from '../integration/imports-support.js';
import { freshBenchDatabase, fmt, printTable } from './support.js';

const WITH_COORDINATES = 100_000;
const GEOCODED = 10_000;

/** 100,000 addresses with coordinates, on invented streets spread over the demo town. */
function csvWithCoordinates(): string {
  const lines = ['Address,City,State,ZIP,Latitude,Longitude,Year Built,Foundation,Owner,Mailing Address'];
  for (let i = 0; i < WITH_COORDINATES; i++) {
    const lon = -96.64 + ((i * 7919) % 4182) / 100_000;
    const lat = 41.1643 + ((i * 104729) % 3147) / 100_000;
    lines.push(
      `${1 + (i % 2000) * 2} Bench Row ${Math.floor(i / 2000) + 1},Tarrowby,ZZ,0009${i % 2},${lat.toFixed(6)},${lon.toFixed(6)},${2000 + (i % 22)},${['slab', 'basement', 'crawlspace'][i % 3]},Owner ${i},"${i} Mail St, Tarrowby, ZZ 00090"`,
    );
  }
  return lines.join('\n') + '\n';
}

/** 10,000 distinct addresses on the demo town's real street ranges, without coordinates. */
function csvToGeocode(): string {
  const streets = JSON.parse(fs.readFileSync(new URL('../../data/demo/streets.geojson', import.meta.url), 'utf8')) as {
    features: { properties: { name: string; zip: string; leftFrom: number; leftTo: number; rightFrom: number; rightTo: number } }[];
  };
  const lines = ['Address,City,State,ZIP,Owner'];
  const seen = new Set<string>();
  for (let step = 0; lines.length <= GEOCODED; step++) {
    for (const f of streets.features) {
      const p = f.properties;
      for (const [from, to] of [[p.leftFrom, p.leftTo], [p.rightFrom, p.rightTo]]) {
        const n = from + 2 * step;
        if (n > to || lines.length > GEOCODED) continue;
        const key = `${n} ${p.name}`;
        if (seen.has(key)) continue;
        seen.add(key);
        lines.push(`${key},Tarrowby,ZZ,${p.zip},Owner ${lines.length}`);
      }
    }
  }
  return lines.join('\n') + '\n';
}

const database = await freshBenchDatabase();
const { rows: [who] } = await database.pool.query(
  `select u.email from users u join companies c on c.id = u.company_id where u.role = 'estimator' order by c.created_at limit 1`,
);

/**
 * PostgreSQL's own COPY of the same file into a scratch table with the file's columns (no indexes), and,
 * for scale, PostgreSQL moving those rows into `homes` itself in one INSERT … SELECT (the table's indexes,
 * GiST included, its checks and foreign keys: the floor any import into this schema pays), rolled back.
 */
async function copyBaseline(csv: string, columns: string[], hasCoordinates: boolean): Promise<{ copyMs: number; floorMs: number }> {
  const client = await database.pool.connect();
  try {
    await client.query('drop table if exists copy_scratch');
    await client.query(`create table copy_scratch (${columns.map((c, i) => `c${i} ${c}`).join(', ')})`);
    const t0 = performance.now();
    await pipeline(Readable.from([csv]), client.query(copyFrom('copy copy_scratch from stdin with (format csv, header true)')));
    const copyMs = performance.now() - t0;
    const { rows: [company] } = await client.query(`select company_id from users where email = $1`, [who.email]);
    await client.query('begin');
    const t1 = performance.now();
    await client.query(
      `insert into homes (company_id, address_key, number, street, city, state, zip, location, owner_name)
       select $1, 'FLOOR|' || row_number() over (), split_part(c0, ' ', 1), c0, c1, c2, c3,
              ST_SetSRID(ST_MakePoint(${hasCoordinates ? 'c5, c4' : '-96.62, 41.18'}), 4326), ${hasCoordinates ? 'c8' : 'c4'}
         from copy_scratch`,
      [company.company_id],
    );
    const floorMs = performance.now() - t1;
    await client.query('rollback');
    await client.query('drop table copy_scratch');
    return { copyMs, floorMs };
  } finally {
    client.release();
  }
}

const geocoder = await startFakeGeocoder(0);
const port = await freePort();
const server = await startServerProcess(port, {
  DATABASE_URL: process.env.BENCH_DATABASE_URL!,
  GEOCODER_URL: geocoder.url,
  LOG_LEVEL: process.env.BENCH_LOG_LEVEL ?? 'error',
  NODE_ENV: 'production',
});
try {
  const client = new ApiClient(`http://127.0.0.1:${port}`);
  await client.signIn(who.email);

  async function timedImport(csv: string, fileName: string) {
    const id = randomUUID();
    const phases: Record<string, number> = {};
    const t0 = performance.now();
    const started = uploadCsv(client, csv, { id, fileName });
    // Watch the stages from the client's side (what the progress bar shows).
    let last = '';
    const watch = (async () => {
      for (;;) {
        const res = await client.get(`/api/imports/${id}`);
        const status = res.status === 200 ? res.body.import.status : 'receiving';
        if (status !== last) {
          phases[status] = performance.now() - t0;
          last = status;
        }
        if (status === 'committed' || status === 'failed') return res.body.import;
        await new Promise((r) => setTimeout(r, 20));
      }
    })();
    const answer = await started;
    if (answer.status !== 202) throw new Error(`${fileName}: ${answer.status} ${JSON.stringify(answer.body)}`);
    const job = await watch;
    const ms = performance.now() - t0;
    if (job.status !== 'committed') throw new Error(`${fileName}: ${JSON.stringify(job.failure)}`);
    await waitForImport(client, id);
    return { ms, job, phases };
  }

  const rows: Record<string, string | number>[] = [];
  const stages: Record<string, string | number>[] = [];
  for (const run of [
    { name: `${WITH_COORDINATES.toLocaleString('en')} rows with coordinates`, csv: csvWithCoordinates(), file: 'bench-coordinates.csv', coordinates: true, columns: ['text', 'text', 'text', 'text', 'float8', 'float8', 'int', 'text', 'text', 'text'] },
    { name: `${GEOCODED.toLocaleString('en')} rows through the fake geocoder`, csv: csvToGeocode(), file: 'bench-geocode.csv', coordinates: false, columns: ['text', 'text', 'text', 'text', 'text'] },
  ]) {
    const bytes = Buffer.byteLength(run.csv);
    const { copyMs, floorMs } = await copyBaseline(run.csv, run.columns, run.coordinates);
    const { ms, job, phases } = await timedImport(run.csv, run.file);
    const n = job.counts.rows as number;
    const importRate = n / (ms / 1000);
    const copyRate = n / (copyMs / 1000);
    rows.push({
      file: run.name,
      'MB': fmt(bytes / 1024 / 1024),
      inserted: job.counts.inserted,
      'updated/unchanged': job.counts.updated + job.counts.unchanged,
      rejected: job.counts.rejected,
      'import s': fmt(ms / 1000),
      'import rows/s': Math.round(importRate),
      'COPY s': fmt(copyMs / 1000),
      'COPY rows/s': Math.round(copyRate),
      'import / COPY': `${fmt((importRate / copyRate) * 100)} %`,
      'target ≥ 25 % of COPY': importRate >= 0.25 * copyRate ? 'met' : 'MISSED',
      'INSERT…SELECT into homes rows/s': Math.round(n / (floorMs / 1000)),
      'import / that': `${fmt((importRate / (n / (floorMs / 1000))) * 100)} %`,
    });
    const at = (k: string) => (phases[k] !== undefined ? fmt(phases[k] / 1000) : '–');
    stages.push({ file: run.name, 'geocoding from s': at('geocoding'), 'assigning from s': at('assigning'), 'writing from s': at('writing'), 'committed at s': at('committed') });
  }
  printTable('Address import vs PostgreSQL COPY of the same rows (one process, sequential, same run)', rows);
  printTable('Stages as the client saw them (seconds from the start of the upload)', stages);
} finally {
  await stopServerProcess(server);
  await geocoder.close();
  await database.close();
}
