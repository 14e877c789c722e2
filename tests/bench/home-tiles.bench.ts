// House-tile latency with 100,000 synthetic homes, beside a static file of the same size served
// by the same process in the same run (issue: the map). Target: p95 < 30 ms and within 3× of static.
import fs from 'node:fs';
import path from 'node:path';
import { freePort, startServerProcess, stopServerProcess } from '../setup/server-process.js';
import { tileFor } from '../setup/tiles.js';
import { freshBenchDatabase, fmt, printTable, summarise } from './support.js';

const HOMES = 100_000;
const REQUESTS_PER_ZOOM = 200;

const database = await freshBenchDatabase();
// The demo company, its town, and 100k more homes scattered over a 12 × 12 km square around it.
const { rows: [company] } = await database.pool.query(`select c.id, ST_X(ST_Centroid(ST_Collect(h.location))) as lon, ST_Y(ST_Centroid(ST_Collect(h.location))) as lat
  from companies c join homes h on h.company_id = c.id group by c.id order by count(*) desc limit 1`);
const started = Date.now();
await database.pool.query(
  `insert into homes (company_id, number, street, city, state, zip, address_key, location, year_built, outcome, last_vacuum_pa, rework_flag)
   select $1, g::text, 'Bench Row', 'Benchton', 'ZZ', '00000', 'BENCH|' || g, ST_SetSRID(ST_MakePoint($2 + (random() - 0.5) * 0.14, $3 + (random() - 0.5) * 0.11), 4326),
          2003 + (g % 19), (array['not_visited','below_action_level','needs_rework','reworked_below','declined','awaiting_test'])[1 + (g % 6)],
          case when g % 3 = 0 then 50 + (g % 400) end, g % 7 = 0
   from generate_series(1, $4) g`,
  [company.id, company.lon, company.lat, HOMES],
);
// Autovacuum visits tables after a large insert (autovacuum_vacuum_insert_threshold); do it now, as it would.
await database.pool.query('vacuum analyze');
const { rows: [{ n }] } = await database.pool.query('select count(*)::int as n from homes');
process.stdout.write(`inserted ${HOMES} synthetic homes in ${Date.now() - started} ms (${n} homes in all)\n`);
const { rows: [admin] } = await database.pool.query(`select email from users where company_id = $1 and role = 'admin'`, [company.id]);
/** A change too wide to list tile by tile (as an import makes): the company's homes version goes up and every cached tile is stale. */
async function pgBump() {
  await database.pool.query(`update companies set homes_version = homes_version + 1 where id = $1`, [company.id]);
}
/** A visit to one synthetic home: its outcome changes, and so do the tiles that draw it. */
const visitWrites: number[] = [];
async function visitOneHome(i: number) {
  const t0 = performance.now();
  await database.pool.query(
    `update homes set outcome = case when outcome = 'needs_rework' then 'awaiting_test' else 'needs_rework' end where company_id = $1 and address_key = $2`,
    [company.id, `BENCH|${1 + ((i * 7919) % HOMES)}`],
  );
  // The write with its triggers: overview cells counted again, the stored tiles that draw the home encoded again.
  visitWrites.push(performance.now() - t0);
}

const port = await freePort();
const server = await startServerProcess(port, { DATABASE_URL: process.env.BENCH_DATABASE_URL!, LOG_LEVEL: 'error', NODE_ENV: 'production' });
const base = `http://127.0.0.1:${port}`;
try {
  const signIn = await fetch(base + '/api/auth/sign-in', {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: admin.email, password: 'demo-pass-2026' }),
  });
  const cookie = signIn.headers.get('set-cookie')!.split(';')[0];

  async function time(url: string, headers: Record<string, string> = {}) {
    const t0 = performance.now();
    const res = await fetch(url, { headers });
    const body = await res.arrayBuffer();
    const ms = performance.now() - t0;
    if (!res.ok) throw new Error(`${url} → ${res.status}`);
    // The server's own account (W3C Server-Timing): where the tile came from (its cache, the tiles the
    // database stores, or built now) and how long reading or building it took.
    const timing = /desc="(\w+)"(?:;dur=([\d.]+))?/.exec(res.headers.get('server-timing') ?? '');
    return { ms, bytes: body.byteLength, source: timing?.[1] ?? 'static', serverMs: timing?.[2] ? Number(timing[2]) : null };
  }

  const rows: Record<string, string | number>[] = [];
  for (const z of [12, 14, 16]) {
    // Tiles over the populated square, visited in a fixed pseudo-random order.
    const centre = tileFor(company.lon, company.lat, z);
    const span = Math.max(1, Math.round((0.14 * 2 ** z) / 360 / 2));
    const tiles: { x: number; y: number }[] = [];
    for (let dx = -span; dx <= span; dx++) for (let dy = -span; dy <= span; dy++) tiles.push({ x: centre.x + dx, y: centre.y + dy });
    // Cold: each tile's first request after the data changed: not in the server's cache, so read from the
    // tiles the database stores (zooms 11 to 14, encoded when their homes changed) or built with PostGIS.
    // Warm: requests for tiles already served at this data version (from the server's tile cache).
    await pgBump(); // a data change, as an import makes: every cached tile is now stale
    for (let i = 0; i < 5; i++) await time(`${base}/tiles/homes/${z}/0/0.pbf?w=${i}`, { Cookie: cookie }); // connection and plan warm-up, outside the town
    const cold: number[] = [];
    const serverMs: number[] = [];
    const sources = new Map<string, number>();
    const sizes: number[] = [];
    const order = tiles.map((_, i) => tiles[(i * 7919) % tiles.length]);
    // Where the zoom has fewer tiles than requests, the data changes again and every tile is built again,
    // until REQUESTS_PER_ZOOM first requests are timed.
    for (let round = 0; cold.length < REQUESTS_PER_ZOOM; round++) {
      if (round > 0) await pgBump();
      for (const t of order.slice(0, REQUESTS_PER_ZOOM - cold.length)) {
        const r = await time(`${base}/tiles/homes/${z}/${t.x}/${t.y}.pbf`, { Cookie: cookie });
        cold.push(r.ms);
        if (r.serverMs != null) serverMs.push(r.serverMs);
        sources.set(r.source, (sources.get(r.source) ?? 0) + 1);
        sizes.push(r.bytes);
      }
    }
    const warm: number[] = [];
    const built = Math.min(tiles.length, REQUESTS_PER_ZOOM);
    for (let i = 0; i < REQUESTS_PER_ZOOM; i++) {
      const t = order[(i * 31) % built];
      warm.push((await time(`${base}/tiles/homes/${z}/${t.x}/${t.y}.pbf?v=${i}`, { Cookie: cookie })).ms);
    }
    // A day on the map: the same tiles asked for while technicians record visits, one home changing every
    // 10 requests. Only the tiles that draw a visited home are built again.
    const visits: number[] = [];
    for (let i = 0; i < REQUESTS_PER_ZOOM; i++) {
      if (i % 10 === 0) await visitOneHome(z * 1000 + i);
      const t = order[(i * 31) % built];
      visits.push((await time(`${base}/tiles/homes/${z}/${t.x}/${t.y}.pbf?d=${i}`, { Cookie: cookie })).ms);
    }
    const meanBytes = Math.round(sizes.reduce((a, b) => a + b, 0) / sizes.length);
    // A static file of the mean tile size, served by the same process (express.static) in the same run.
    const staticName = `bench-static-${z}.bin`;
    const staticPath = path.resolve('dist/client', staticName);
    fs.writeFileSync(staticPath, Buffer.alloc(meanBytes, 7));
    const staticSamples: number[] = [];
    for (let i = 0; i < 20; i++) await time(`${base}/${staticName}`);
    for (let i = 0; i < REQUESTS_PER_ZOOM; i++) staticSamples.push((await time(`${base}/${staticName}?v=${i}`)).ms);
    // For reading the table only, not a target: the same file asked for with the session cookie, as a
    // signed-in browser would (the session middleware then looks up the session and the user).
    const signedInSamples: number[] = [];
    for (let i = 0; i < REQUESTS_PER_ZOOM; i++) signedInSamples.push((await time(`${base}/${staticName}?s=${i}`, { Cookie: cookie })).ms);
    fs.rmSync(staticPath);
    const stat = summarise(staticSamples);
    const signedIn = summarise(signedInSamples);
    if (serverMs.length !== cold.length) throw new Error(`${cold.length - serverMs.length} of ${cold.length} cold requests came from the server's cache`);
    const read = summarise(serverMs);
    for (const [kind, samples] of [['cold (not in cache)', cold], ['warm (cached)', warm], ['during visits', visits]] as const) {
      const tile = summarise(samples);
      rows.push({
        zoom: z,
        requests: `${samples.length} ${kind}`,
        tiles: tiles.length,
        'mean tile bytes': meanBytes,
        'tile p50 ms': fmt(tile.p50),
        'tile p95 ms': fmt(tile.p95),
        'of it reading or building p50/p95 ms': samples === cold ? `${fmt(read.p50)} / ${fmt(read.p95)} (${[...sources].map(([k, n]) => `${n} ${k}`).join(', ')})` : '-',
        'static p50 ms': fmt(stat.p50),
        'static p95 ms': fmt(stat.p95),
        'p95 ratio': fmt(tile.p95 / stat.p95),
        'target p95 < 30 ms': tile.p95 < 30 ? 'met' : 'MISSED',
        'target ≤ 3× static': tile.p95 <= 3 * stat.p95 ? 'met' : 'MISSED',
        'static with session cookie p95 ms (for reading)': fmt(signedIn.p95),
      });
    }
  }
  printTable(`House tiles, ${HOMES.toLocaleString('en')} synthetic homes + demo, ${REQUESTS_PER_ZOOM} sequential requests per zoom`, rows);
  const writes = summarise(visitWrites);
  printTable('What keeping the map costs a visit: one home\'s outcome written, with its triggers (cells counted, stored tiles encoded)', [
    { writes: writes.n, 'p50 ms': fmt(writes.p50), 'p95 ms': fmt(writes.p95), 'max ms': fmt(writes.max) },
  ]);
} finally {
  await stopServerProcess(server);
  await database.close();
}
