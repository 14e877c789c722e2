import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';
import { decodeTile, tileFor } from '../setup/tiles.js';
import { homeMapMismatches } from '../setup/home-cells.js';
import { OUTCOMES } from '../../shared/schemas/enums.js';
import { HOMES_DETAIL_MIN_ZOOM, HOMES_MAX_TILE_ZOOM, HOMES_MIN_ZOOM } from '../../shared/schemas/map.js';
import { homesTileQuery, OUTCOME_PRIORITY } from '../../server/modules/home-tiles/home-tiles.repository.js';
import { createHomeTiles, warmTileConnections } from '../../server/modules/home-tiles/home-tiles.service.js';
import { insertPlan } from '../../server/modules/sampling/sampling.repository.js';
import { lockHome } from '../../server/modules/homes/homes.repository.js';
import { deferHomeCells, homesByKey } from '../../server/modules/imports/imports.repository.js';

let app: TestApp;
let tech: ApiClient;
let home: { id: string; ref: number; lon: number; lat: number; yearBuilt: number | null };

beforeAll(async () => {
  app = await startTestApp();
  tech = new ApiClient(app.url);
  await tech.signIn(demoUser('technician'));
  home = (await tech.get('/api/homes?limit=1')).body.homes[0];
});
afterAll(() => app.close());

async function fetchTile(client: ApiClient, path: string) {
  const res = await fetch(app.url + path, { headers: { Cookie: client.cookie } });
  return { status: res.status, type: res.headers.get('content-type'), timing: res.headers.get('server-timing') ?? '', body: new Uint8Array(await res.arrayBuffer()) };
}

/**
 * Homes of a company inside a tile's envelope grown (or shrunk) by `marginUnits` of the 4096 grid,
 * counted by PostGIS directly.
 */
async function sqlCount(companyOf: string, z: number, x: number, y: number, extra = '', marginUnits = 0) {
  const { rows } = await app.database.pool.query(
    `select count(*)::int as n from homes h join users u on u.company_id = h.company_id
     where u.email = $1 and ST_Intersects(ST_Transform(h.location, 3857), ST_TileEnvelope($2, $3, $4, margin => $5::float8 / 4096)) ${extra}`,
    [companyOf, z, x, y, marginUnits],
  );
  return rows[0].n as number;
}

/** Features whose decoded point lies inside the tile proper (MVT spec 2.1 §4.3: tile coordinates 0..extent). */
function insideCount(layer: { length: number; extent: number; feature(i: number): { loadGeometry(): { x: number; y: number }[][] } }) {
  let n = 0;
  for (let i = 0; i < layer.length; i++) {
    const [p] = layer.feature(i).loadGeometry()[0];
    if (p.x >= 0 && p.x < layer.extent && p.y >= 0 && p.y < layer.extent) n++;
  }
  return n;
}

/** Quantising to the 4096 grid moves a point by under one unit, so the exact count lies between these two. */
async function expectSameHomes(layer: Parameters<typeof insideCount>[0], z: number, x: number, y: number, extra = '') {
  const n = insideCount(layer);
  expect(n).toBeGreaterThanOrEqual(await sqlCount(demoUser('technician'), z, x, y, extra, -1));
  expect(n).toBeLessThanOrEqual(await sqlCount(demoUser('technician'), z, x, y, extra, 1));
}

describe('homes vector tiles', () => {
  it('returns a valid Mapbox Vector Tile with every demo home in the tile and their properties', async () => {
    const { z, x, y } = tileFor(home.lon, home.lat, 15);
    const res = await fetchTile(tech, `/tiles/homes/${z}/${x}/${y}.pbf`);
    expect(res.status).toBe(200);
    expect(res.type).toBe('application/x-protobuf');
    const layer = decodeTile(res.body).layers.homes;
    expect(layer).toBeDefined();
    expect(layer.extent).toBe(4096); // MVT spec 2.1 §4.2 default extent
    await expectSameHomes(layer, z, x, y);
    expect(layer.length).toBeGreaterThan(0);
    // The feature id (MVT spec 2.1 §4.2, an unsigned integer) is the home's short number.
    const ids = Array.from({ length: layer.length }, (_, i) => layer.feature(i).id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids).toContain(home.ref);
    const f = layer.feature(ids.indexOf(home.ref));
    expect(f.type).toBe(1); // MVT spec 2.1 §4.3.4: 1 = POINT
    expect(OUTCOMES).toContain(f.properties.outcome);
    expect(f.properties).toHaveProperty('year');
    expect(f.properties).not.toHaveProperty('id');
    // Flags are left out when false (MVT spec 2.1 §4.2: a feature carries tags only for values it has).
    for (let i = 0; i < layer.length; i++) {
      const p = layer.feature(i).properties;
      expect(p.rework === undefined || p.rework === true).toBe(true);
      expect(p.planned === undefined || p.planned === true).toBe(true);
    }
    // A tap names the home by that number: it opens the same home.
    const opened = await tech.get(`/api/homes/ref/${home.ref}`);
    expect(opened.status).toBe(200);
    expect(opened.body.home.id).toBe(home.id);
  });

  it('filters by outcome exactly as a direct SQL count does', async () => {
    const { z, x, y } = tileFor(home.lon, home.lat, 15);
    const res = await fetchTile(tech, `/tiles/homes/${z}/${x}/${y}.pbf?outcome=not_visited`);
    const layer = decodeTile(res.body).layers.homes;
    await expectSameHomes(layer, z, x, y, "and h.outcome = 'not_visited'");
    for (let i = 0; i < layer.length; i++) expect(layer.feature(i).properties.outcome).toBe('not_visited');
  });

  it('below the detail zoom, draws one mark per 8-px cell whose home counts add up to the homes in the tile', async () => {
    const { z, x, y } = tileFor(home.lon, home.lat, HOMES_DETAIL_MIN_ZOOM - 1);
    const layer = decodeTile((await fetchTile(tech, `/tiles/homes/${z}/${x}/${y}.pbf`)).body).layers.homes;
    let inside = 0;
    const cells = new Set<string>();
    for (let i = 0; i < layer.length; i++) {
      const f = layer.feature(i);
      const [p] = f.loadGeometry()[0];
      expect(f.id).toBeUndefined();
      expect(OUTCOMES).toContain(f.properties.outcome);
      expect(Number(f.properties.homes)).toBeGreaterThan(0);
      cells.add(`${p.x},${p.y}`);
      if (p.x >= 0 && p.x < layer.extent && p.y >= 0 && p.y < layer.extent) inside += Number(f.properties.homes);
    }
    expect(cells.size).toBe(layer.length); // one mark per cell
    // Quantising moves a point by under one grid unit; the cells line up with the tile edges.
    expect(inside).toBeGreaterThanOrEqual(await sqlCount(demoUser('technician'), z, x, y, '', -1));
    expect(inside).toBeLessThanOrEqual(await sqlCount(demoUser('technician'), z, x, y, '', 1));
    expect(layer.length).toBeLessThan(inside); // the demo town has cells with several homes
  });

  it('shows a change to a home on the next request (the tile cache keys on the homes version)', async () => {
    const { z, x, y } = tileFor(home.lon, home.lat, 15);
    const before = decodeTile((await fetchTile(tech, `/tiles/homes/${z}/${x}/${y}.pbf`)).body).layers.homes;
    const idsBefore = Array.from({ length: before.length }, (_, i) => before.feature(i).id);
    expect(idsBefore).toContain(home.ref);
    await app.database.pool.query(`update homes set year_built = 1901 where id = $1`, [home.id]);
    try {
      const after = decodeTile((await fetchTile(tech, `/tiles/homes/${z}/${x}/${y}.pbf`)).body).layers.homes;
      const f = Array.from({ length: after.length }, (_, i) => after.feature(i)).find((g) => g.id === home.ref)!;
      expect(f.properties.year).toBe(1901);
    } finally {
      await app.database.pool.query(`update homes set year_built = $2 where id = $1`, [home.id, home.yearBuilt ?? null]);
    }
  });

  it('carries the last manometer vacuum in in. WC and the last post-mitigation level in pCi/L', async () => {
    const { rows: [measured] } = await app.database.pool.query(
      `select h.ref::int as ref, ST_X(h.location) as lon, ST_Y(h.location) as lat, h.last_vacuum_pa, h.last_post_bq_m3
       from homes h join users u on u.company_id = h.company_id
       where u.email = $1 and h.last_vacuum_pa is not null and h.last_post_bq_m3 is not null limit 1`,
      [demoUser('technician')],
    );
    expect(measured).toBeDefined();
    const { z, x, y } = tileFor(measured.lon, measured.lat, 16);
    const layer = decodeTile((await fetchTile(tech, `/tiles/homes/${z}/${x}/${y}.pbf`)).body).layers.homes;
    const f = Array.from({ length: layer.length }, (_, i) => layer.feature(i)).find((g) => g.id === measured.ref)!;
    // 1 in. WC = 249.0889 Pa (NIST SP 811 B.8); 1 pCi/L = 37 Bq/m³ (1 Ci = 3.7e10 Bq, curie definition).
    expect(f.properties.vacuum_in_wc).toBeCloseTo(Math.round((measured.last_vacuum_pa / 249.0889) * 100) / 100, 9);
    expect(f.properties.post_pci_l).toBeCloseTo(Math.round((measured.last_post_bq_m3 / 37) * 10) / 10, 9);
  });

  it('builds a tile once when several ask for it at the same moment', async () => {
    const { rows: [company] } = await app.database.pool.query(`select company_id as id from users where email = $1`, [demoUser('technician')]);
    const tiles = createHomeTiles(app.database.tiles);
    const { z, x, y } = tileFor(home.lon, home.lat, 15);
    const answers = await Promise.all(Array.from({ length: 5 }, () => tiles.tile(company.id, z, x, y, { outcome: undefined })));
    expect(tiles.stats().misses).toBe(1);
    expect(answers[0].data.length).toBeGreaterThan(0);
    for (const a of answers) expect(Buffer.compare(a.data, answers[0].data)).toBe(0);
    // Once built, from the cache.
    expect((await tiles.tile(company.id, z, x, y, { outcome: undefined })).source).toBe('cached');
    expect(tiles.stats().misses).toBe(1);
  });

  it('opens and warms every tile connection at start', async () => {
    const pool = (app.database.tiles as unknown as { $client: { totalCount: number } }).$client;
    await warmTileConnections(app.database.tiles, app.database.tileConnections);
    expect(app.database.tileConnections).toBeGreaterThan(1);
    expect(pool.totalCount).toBe(app.database.tileConnections);
  });

  it('answers an empty, valid tile outside the town', async () => {
    const res = await fetchTile(tech, '/tiles/homes/14/0/0.pbf');
    expect(res.status).toBe(200);
    expect(Object.keys(decodeTile(res.body).layers)).toEqual([]);
    // Below the homes zooms, over the town: empty too, and said so.
    const { x, y } = tileFor(home.lon, home.lat, HOMES_MIN_ZOOM - 1);
    const above = await fetchTile(tech, `/tiles/homes/${HOMES_MIN_ZOOM - 1}/${x}/${y}.pbf`);
    expect(above.status).toBe(200);
    expect(Object.keys(decodeTile(above.body).layers)).toEqual([]);
    expect(above.timing).toBe('tile;desc="none"');
  });

  it("never draws another company's homes", async () => {
    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    const { z, x, y } = tileFor(home.lon, home.lat, 15);
    const layer = decodeTile((await fetchTile(other, `/tiles/homes/${z}/${x}/${y}.pbf`)).body).layers.homes;
    const ids = layer ? Array.from({ length: layer.length }, (_, i) => layer.feature(i).id) : [];
    expect(ids).not.toContain(home.ref);
    // Nor opens one by its number.
    expect((await other.get(`/api/homes/ref/${home.ref}`)).status).toBe(404);
  });

  it.each([
    ['/tiles/homes/23/0/0.pbf', 'z'],
    ['/tiles/homes/3/8/0.pbf', 'x'],
    ['/tiles/homes/3/0/8.pbf', 'y'],
    ['/tiles/homes/a/0/0.pbf', 'z'],
    ['/tiles/homes/14/1/1.pbf?outcome=bogus', 'outcome'],
  ])('rejects %s with 400 naming %s', async (path, field) => {
    const res = await fetchTile(tech, path);
    expect(res.status).toBe(400);
    const body = JSON.parse(Buffer.from(res.body).toString());
    expect(body.error.fields.map((f: { field: string }) => f.field)).toContain(field);
  });

  it('refuses a home number that is not a positive integer, naming ref', async () => {
    for (const bad of ['0', '-3', '1.5', 'abc']) {
      const res = await tech.get(`/api/homes/ref/${bad}`);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.map((f: { field: string }) => f.field)).toContain('ref');
    }
  });

  it('needs a signed-in user', async () => {
    const res = await fetch(app.url + '/tiles/homes/14/1/1.pbf');
    expect(res.status).toBe(401);
  });
});

describe('overview cells kept by database triggers (home_cells)', () => {
  const mismatches = () => homeMapMismatches(app.database.pool);
  async function companyId() {
    const { rows } = await app.database.pool.query(`select company_id from users where email = $1`, [demoUser('technician')]);
    return rows[0].company_id as string;
  }

  it('holds one row per occupied cell at each overview zoom, equal to counting the homes afresh', async () => {
    const { rows } = await app.database.pool.query(`select array_agg(distinct z order by z) as zooms, sum(homes)::int as homes from home_cells where z = ${HOMES_MIN_ZOOM}`);
    const { rows: [all] } = await app.database.pool.query(`select count(*)::int as n from homes`);
    expect(rows[0].zooms).toEqual([HOMES_MIN_ZOOM]);
    expect(rows[0].homes).toBe(all.n);
    const { rows: zooms } = await app.database.pool.query(`select distinct z from home_cells order by z`);
    expect(zooms.map((r) => r.z)).toEqual(Array.from({ length: HOMES_DETAIL_MIN_ZOOM - HOMES_MIN_ZOOM }, (_, i) => HOMES_MIN_ZOOM + i));
    expect(await mismatches()).toEqual([]);
  });

  it('keeps Web Mercator metres equal to PostGIS ST_Transform to EPSG:3857 within a micrometre', async () => {
    const { rows: [d] } = await app.database.pool.query(
      `select count(*)::int as n, max(abs(merc_x - ST_X(ST_Transform(location, 3857)))) as dx, max(abs(merc_y - ST_Y(ST_Transform(location, 3857)))) as dy from homes`,
    );
    expect(d.n).toBeGreaterThan(0);
    expect(d.dx).toBeLessThan(1e-6);
    expect(d.dy).toBeLessThan(1e-6);
  });

  it('ranks outcomes in SQL in the order the tiles name them', async () => {
    const { rows } = await app.database.pool.query(`select o, outcome_attention_rank(o) as r, outcome_of_attention_rank(outcome_attention_rank(o)) as back from unnest($1::text[]) o`, [[...OUTCOMES]]);
    for (const { o, r, back } of rows) {
      expect(r).toBe(OUTCOME_PRIORITY.indexOf(o) + 1);
      expect(back).toBe(o);
    }
  });

  it('follows homes added, moved, re-measured and removed, one at a time and in bulk', async () => {
    const company = await companyId();
    const pool = app.database.pool;
    const add = (n: number, tag: string) =>
      pool.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location, year_built, outcome)
         select $1, g::text, 'Cell Check Row', 'Testville', 'ZZ', '00001', $2 || g, ST_SetSRID(ST_MakePoint($3 + (g % 97) * 0.0007, $4 + (g / 97) * 0.0006), 4326), 1990 + g % 30, 'not_visited'
         from generate_series(1, $5) g`,
        [company, `CELLCHECK-${tag}|`, home.lon, home.lat, n],
      );
    try {
      await add(3, 'few');
      expect(await mismatches()).toEqual([]);
      // Moved across cells, measured, marked for rework: each changes what a cell shows.
      await pool.query(`update homes set location = ST_SetSRID(ST_MakePoint($2, $3), 4326) where address_key = 'CELLCHECK-few|1' and company_id = $1`, [company, home.lon + 0.05, home.lat - 0.04]);
      await pool.query(`update homes set outcome = 'needs_rework', last_vacuum_pa = 187.5, last_post_bq_m3 = 260, rework_flag = true where address_key = 'CELLCHECK-few|2'`);
      expect(await mismatches()).toEqual([]);
      await pool.query(`delete from homes where address_key = 'CELLCHECK-few|3'`);
      expect(await mismatches()).toEqual([]);
      // More than 5,000 homes in one statement: the company's cells are built again in one pass.
      await add(6000, 'bulk');
      expect(await mismatches()).toEqual([]);
      await pool.query(`delete from homes where address_key like 'CELLCHECK-bulk|%'`);
      expect(await mismatches()).toEqual([]);
    } finally {
      await pool.query(`delete from homes where address_key like 'CELLCHECK-%'`);
    }
    expect(await mismatches()).toEqual([]);
  });

  it('stays right when two transactions change homes of one cell at the same time', async () => {
    const company = await companyId();
    const pool = app.database.pool;
    // 2,101 homes a few metres apart, homes 1 and 2 in one zoom-13 cell. The first transaction changes
    // all but home 2 in one statement (more than 2,000 homes: the company's version, not tile rows, goes
    // up, so nothing else makes the second wait); the second changes home 2.
    await pool.query(
      `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome)
       select $1, g::text, 'Same Cell Row', 'Testville', 'ZZ', '00001', 'SAMECELL|' || g,
              ST_SetSRID(ST_MakePoint($2 + (g % 50) * 0.00003, $3 + (g / 50) * 0.00003), 4326), 'not_visited'
       from generate_series(1, 2101) g`,
      [company, home.lon + 0.02, home.lat + 0.02],
    );
    const first = await pool.connect();
    const second = await pool.connect();
    try {
      await first.query('begin');
      await first.query(`update homes set outcome = 'needs_rework', rework_flag = true where address_key like 'SAMECELL|%' and address_key <> 'SAMECELL|2'`);
      await second.query('begin');
      // Waits until the first commits, then counts the cell with the first's change in it.
      const secondUpdate = second.query(`update homes set outcome = 'below_action_level', last_vacuum_pa = 150 where address_key = 'SAMECELL|2'`);
      await new Promise((resolve) => setTimeout(resolve, 300));
      await first.query('commit');
      await secondUpdate;
      await second.query('commit');
      expect(await mismatches()).toEqual([]);
    } finally {
      first.release();
      second.release();
      await pool.query(`delete from homes where address_key like 'SAMECELL|%'`);
    }
    expect(await mismatches()).toEqual([]);
  });

  it('draws the same overview tile from the kept cells as from counting the homes', async () => {
    const company = await companyId();
    const { rows: [was] } = await app.database.pool.query(`select outcome, rework_flag, last_vacuum_pa from homes where id = $1`, [home.id]);
    await app.database.pool.query(`update homes set outcome = 'needs_rework', rework_flag = true, last_vacuum_pa = 120 where id = $1`, [home.id]);
    try {
      for (const zoom of [HOMES_MIN_ZOOM, HOMES_DETAIL_MIN_ZOOM - 1]) {
        const { z, x, y } = tileFor(home.lon, home.lat, zoom);
        const features = async (liveCells: boolean) => {
          const { rows } = await app.database.db.execute<{ mvt: Buffer }>(homesTileQuery(company, z, x, y, { outcome: undefined }, { liveCells }));
          const layer = decodeTile(new Uint8Array(rows[0].mvt)).layers.homes;
          return Array.from({ length: layer.length }, (_, i) => {
            const { vacuum_in_wc, ...rest } = layer.feature(i).properties;
            return { key: JSON.stringify([layer.feature(i).loadGeometry(), rest]), vacuum: vacuum_in_wc as number | undefined };
          }).sort((a, b) => a.key.localeCompare(b.key));
        };
        const kept = await features(false);
        const live = await features(true);
        expect(kept.length).toBeGreaterThan(0);
        expect(kept.map((f) => f.key)).toEqual(live.map((f) => f.key));
        // The mean vacuum is a sum over the cell's homes; added in another order it can round the other
        // way at a half-way hundredth, never by more.
        kept.forEach((f, i) => (f.vacuum === undefined ? expect(live[i].vacuum).toBeUndefined() : expect(Math.abs(f.vacuum - live[i].vacuum!)).toBeLessThanOrEqual(0.01 + 1e-9)));
        expect(kept.some((f) => f.key.includes('"outcome":"needs_rework"') && f.key.includes('"rework":true'))).toBe(true);
      }
    } finally {
      await app.database.pool.query(`update homes set outcome = $2, rework_flag = $3, last_vacuum_pa = $4 where id = $1`, [home.id, was.outcome, was.rework_flag, was.last_vacuum_pa]);
    }
  });
});

describe('tiles stored by database triggers (home_tiles)', () => {
  const lonInsideEastEdge = (z: number, x: number, units: number) => ((x + 1 - units / 4096) / 2 ** z) * 360 - 180;
  async function company() {
    const { rows } = await app.database.pool.query(`select company_id from users where email = $1`, [demoUser('technician')]);
    return rows[0].company_id as string;
  }
  async function storedFeature(z: number, x: number, y: number, ref: number) {
    const { rows } = await app.database.pool.query(`select mvt from home_tiles where company_id = $1 and z = $2 and x = $3 and y = $4`, [await company(), z, x, y]);
    if (!rows[0]) return undefined;
    const layer = decodeTile(new Uint8Array(rows[0].mvt)).layers.homes;
    const f = Array.from({ length: layer.length }, (_, i) => layer.feature(i)).find((g) => g.id === ref);
    return f && { properties: f.properties, point: f.loadGeometry()[0][0] };
  }

  it('stores every unfiltered tile from zoom 11 to 14 that shows a home, each as a tile built now would draw it', async () => {
    const { rows } = await app.database.pool.query(`select array_agg(distinct z order by z) as zooms, count(*)::int as n from home_tiles`);
    expect(rows[0].zooms).toEqual([11, 12, 13, 14]);
    expect(rows[0].n).toBeGreaterThan(4);
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
  });

  it('serves unfiltered tiles up to zoom 14 from the store, and builds filtered and deeper ones', async () => {
    const at = (z: number) => tileFor(home.lon, home.lat, z);
    const path = (z: number, query = '') => `/tiles/homes/${z}/${at(z).x}/${at(z).y}.pbf${query}`;
    for (const z of [HOMES_MIN_ZOOM, HOMES_DETAIL_MIN_ZOOM]) expect((await fetchTile(tech, path(z, `?stored=${z}`))).timing).toMatch(/stored|cached/);
    expect((await fetchTile(tech, path(HOMES_DETAIL_MIN_ZOOM, '?outcome=not_visited'))).timing).toContain('built');
    expect((await fetchTile(tech, path(HOMES_DETAIL_MIN_ZOOM + 1))).timing).toMatch(/built|cached/);
  });

  it('draws a home on a tile edge in the neighbour tile it reaches, and takes it out when the home goes', async () => {
    const z = HOMES_DETAIL_MIN_ZOOM;
    const { x, y } = tileFor(home.lon, home.lat, z);
    const { rows: [edge] } = await app.database.pool.query(
      `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome)
       values ($1, '1', 'Stored Edge Row', 'Testville', 'ZZ', '00001', 'STORED-EDGE|1', ST_SetSRID(ST_MakePoint($2, $3), 4326), 'not_visited') returning ref::int as ref`,
      [await company(), lonInsideEastEdge(z, x, 10), home.lat],
    );
    try {
      expect((await storedFeature(z, x, y, edge.ref))?.properties.outcome).toBe('not_visited');
      const inNeighbour = await storedFeature(z, x + 1, y, edge.ref);
      expect(inNeighbour?.point.x).toBeLessThan(0); // in the neighbour's margin (MVT spec 2.1 §4.3)
      await app.database.pool.query(`update homes set outcome = 'needs_rework', rework_flag = true where ref = $1`, [edge.ref]);
      expect((await storedFeature(z, x + 1, y, edge.ref))?.properties).toMatchObject({ outcome: 'needs_rework', rework: true });
    } finally {
      await app.database.pool.query(`delete from homes where address_key = 'STORED-EDGE|1'`);
    }
    expect(await storedFeature(z, x, y, edge.ref)).toBeUndefined();
    expect(await storedFeature(z, x + 1, y, edge.ref)).toBeUndefined();
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
  });

  it('draws the homes of a new sampling plan as planned, and the homes of the plan it replaces as before', async () => {
    const pool = app.database.pool;
    const { rows: [target] } = await pool.query(
      `select h.id, h.ref::int as ref, h.community_id, ST_X(h.location) as lon, ST_Y(h.location) as lat from homes h
       where h.company_id = $1 and h.outcome = 'not_visited' and h.community_id is not null
         and h.id not in (select home_id from planned_home_ids($1)) limit 1`,
      [await company()],
    );
    const { z, x, y } = tileFor(target.lon, target.lat, HOMES_DETAIL_MIN_ZOOM);
    expect((await storedFeature(z, x, y, target.ref))?.properties.planned).toBeUndefined();
    const { rows: [plan] } = await pool.query(
      `insert into sampling_plans (company_id, community_id, margin_of_error, expected_rate, sample_size) values ($1, $2, 0.1, 0.3, 1) returning id`,
      [await company(), target.community_id],
    );
    try {
      await pool.query(`insert into sampling_plan_homes (plan_id, home_id) values ($1, $2)`, [plan.id, target.id]);
      expect((await storedFeature(z, x, y, target.ref))?.properties.planned).toBe(true);
      // Homes of the community's plan before this one are no longer planned; the overview marks follow too.
      expect(await homeMapMismatches(pool)).toEqual([]);
    } finally {
      await pool.query(`delete from sampling_plans where id = $1`, [plan.id]);
    }
    expect((await storedFeature(z, x, y, target.ref))?.properties.planned).toBeUndefined();
    expect(await homeMapMismatches(pool)).toEqual([]);
  });
  it('stores the tiles of homes at the edges of the Web Mercator square, whose margins reach past it', async () => {
    // Longitude ±180 and latitude ±85.0511 are the square's edges (EPSG:3857); tile columns and rows run 0 to 2^z - 1.
    const corners = [[179.99999, 85.05], [-180, -85.06], [180, 0], [-179.99999, 85.0511]];
    try {
      await app.database.pool.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome)
         select $1, c.n::text, 'World Edge Row', 'Testville', 'ZZ', '00001', 'WORLD-EDGE|' || c.n, ST_SetSRID(ST_MakePoint(c.lon, c.lat), 4326), 'not_visited'
         from unnest($2::float8[], $3::float8[]) with ordinality as c(lon, lat, n)`,
        [await company(), corners.map((c) => c[0]), corners.map((c) => c[1])],
      );
      await app.database.pool.query(`update homes set outcome = 'declined' where address_key like 'WORLD-EDGE|%'`);
      const { rows } = await app.database.pool.query(
        `select z, x, y from home_tiles where company_id = $1 and (x = 0 or y = 0 or x = (1 << z) - 1 or y = (1 << z) - 1) order by z, x, y`,
        [await company()],
      );
      // Per zoom: the two north corners, the south-west corner (latitude clamped to the square), and at
      // longitude 180 on the equator the last column's two tiles meeting there (the point is on both margins).
      const expected = [11, 12, 13, 14].flatMap((z) => {
        const last = 2 ** z - 1;
        const half = 2 ** (z - 1);
        return [{ z, x: 0, y: 0 }, { z, x: 0, y: last }, { z, x: last, y: 0 }, { z, x: last, y: half - 1 }, { z, x: last, y: half }];
      });
      expect(rows).toEqual(expected);
      const last = (1 << HOMES_MIN_ZOOM) - 1;
      const tile = await fetchTile(tech, `/tiles/homes/${HOMES_MIN_ZOOM}/${last}/0.pbf`);
      expect(tile.status).toBe(200);
      expect(decodeTile(tile.body).layers.homes.length).toBeGreaterThan(0);
      expect(await homeMapMismatches(app.database.pool)).toEqual([]);
    } finally {
      await app.database.pool.query(`delete from homes where address_key like 'WORLD-EDGE|%'`);
    }
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
  });

  it('lets a sampling plan and a visit of the company through while an import writes its homes, with no deadlock', async () => {
    // An import defers its map until its homes are written (tractwise.home_cells_deferred), then refreshes
    // it in one statement. Before then it holds neither the map's advisory lock nor the company's row.
    const pool = app.database.pool;
    const { rows: [target] } = await pool.query(
      `select id, community_id, last_vacuum_pa from homes where company_id = $1 and community_id is not null and outcome = 'not_visited' limit 1`,
      [await company()],
    );
    const importing = await pool.connect();
    const other = await pool.connect();
    let planId: string | undefined;
    try {
      await importing.query('begin');
      await importing.query(`select set_config('tractwise.home_cells_deferred', 'on', true)`);
      await importing.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome)
         select $1, g::text, 'Deferred Import Row', 'Testville', 'ZZ', '00001', 'DEFERRED|' || g,
                ST_SetSRID(ST_MakePoint($2 + (g % 50) * 0.0001, $3 + (g / 50) * 0.0001), 4326), 'not_visited'
         from generate_series(1, 2500) g`,
        [await company(), home.lon + 0.03, home.lat - 0.03],
      );
      await other.query(`set lock_timeout = '5s'`);
      await other.query('begin');
      const { rows: [plan] } = await other.query(
        `insert into sampling_plans (company_id, community_id, margin_of_error, expected_rate, sample_size) values ($1, $2, 0.1, 0.3, 1) returning id`,
        [await company(), target.community_id],
      );
      planId = plan.id;
      await other.query(`insert into sampling_plan_homes (plan_id, home_id) values ($1, $2)`, [plan.id, target.id]);
      await other.query(`update homes set last_vacuum_pa = 90 where id = $1`, [target.id]);
      await other.query('commit');
      await importing.query(
        `select refresh_home_map_at(array_agg(company_id), array_agg(merc_x), array_agg(merc_y)) from homes where address_key like 'DEFERRED|%'`,
      );
      await importing.query('commit');
      expect(await homeMapMismatches(pool)).toEqual([]);
    } finally {
      await importing.query('rollback').catch(() => undefined);
      await other.query('rollback').catch(() => undefined);
      await other.query(`reset lock_timeout`);
      importing.release();
      other.release();
      if (planId) await pool.query(`delete from sampling_plans where id = $1`, [planId]);
      await pool.query(`update homes set last_vacuum_pa = $2 where id = $1`, [target.id, target.last_vacuum_pa]);
      await pool.query(`delete from homes where address_key like 'DEFERRED|%'`);
    }
    expect(await homeMapMismatches(pool)).toEqual([]);
  });
  it('writes a sampling plan over homes that an import and a visit hold, with no deadlock', async () => {
    // The import and the visit lock their homes first and ask for the map's lock when they write them;
    // the plan takes the map's lock with its first row. It must not then wait on their homes.
    const pool = app.database.pool;
    const companyId = await company();
    const { rows: [h1, h2] } = await pool.query(
      `select id, address_key, community_id, last_vacuum_pa from homes where company_id = $1 and community_id is not null order by ref limit 2`,
      [companyId],
    );
    const { rows: [me] } = await pool.query(`select id from users where email = $1`, [demoUser('technician')]);
    const importing = await pool.connect();
    let openGate = () => {};
    const gate = new Promise<void>((resolve) => (openGate = resolve));
    let visitLocked = () => {};
    const locked = new Promise<void>((resolve) => (visitLocked = resolve));
    let planId: string | undefined;
    const visit = app.database.db.transaction(async (tx) => {
      await lockHome(tx, companyId, h2.id);
      visitLocked();
      await gate;
      await tx.execute(sql`update homes set last_vacuum_pa = 77 where id = ${h2.id}`);
    });
    try {
      await importing.query('begin');
      await deferHomeCells(importing);
      expect((await homesByKey(importing, companyId, [h1.address_key], true)).size).toBe(1);
      await locked;
      const plan = app.database.db.transaction((tx) =>
        insertPlan(tx, { companyId, communityId: h1.community_id, marginOfError: 0.1, expectedRate: 0.3, sampleSize: 2, createdBy: me.id }, [h1.id, h2.id]),
      );
      planId = await Promise.race([plan, new Promise<string>((_, reject) => setTimeout(() => reject(new Error('the plan waited on homes an import and a visit hold')), 5000))]);
      openGate();
      await visit;
      await importing.query(`update homes set last_vacuum_pa = 66 where id = $1`, [h1.id]);
      await importing.query(`select refresh_home_map_at(array[$1::uuid, $1::uuid], array_agg(merc_x), array_agg(merc_y)) from homes where id in ($2, $3)`, [companyId, h1.id, h2.id]);
      await importing.query('commit');
      const { rows } = await pool.query(`select home_id from sampling_plan_homes where plan_id = $1 order by home_id`, [planId]);
      expect(rows.map((r) => r.home_id)).toEqual([h1.id, h2.id].sort());
      expect(await homeMapMismatches(pool)).toEqual([]);
    } finally {
      await importing.query('rollback').catch(() => undefined);
      importing.release();
      openGate();
      await visit.catch(() => undefined);
      if (planId) await pool.query(`delete from sampling_plans where id = $1`, [planId]);
      await pool.query(`update homes set last_vacuum_pa = $2 where id = $1`, [h1.id, h1.last_vacuum_pa]);
      await pool.query(`update homes set last_vacuum_pa = $2 where id = $1`, [h2.id, h2.last_vacuum_pa]);
    }
    expect(await homeMapMismatches(pool)).toEqual([]);
  });
  it('takes a deleted builder off its homes and keeps the stored map right', async () => {
    const pool = app.database.pool;
    const companyId = await company();
    const editor = new ApiClient(app.url);
    await editor.signIn(demoUser('estimator'));
    const { rows: [builder] } = await pool.query(`insert into builders (company_id, name) values ($1, 'Doomed Tile Builder') returning id`, [companyId]);
    try {
      await pool.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome, builder_id)
         select $1, g::text, 'Doomed Builder Row', 'Testville', 'ZZ', '00001', 'DOOMED-B|' || g, ST_SetSRID(ST_MakePoint($2 + g * 0.0002, $3), 4326), 'not_visited', $4
         from generate_series(1, 3) g`,
        [companyId, home.lon - 0.01, home.lat + 0.01, builder.id],
      );
      expect((await editor.delete(`/api/builders/${builder.id}`)).status).toBe(204);
      const { rows } = await pool.query(`select count(*)::int as n, count(builder_id)::int as with_builder from homes where address_key like 'DOOMED-B|%'`);
      expect(rows[0]).toEqual({ n: 3, with_builder: 0 });
      expect(await homeMapMismatches(pool)).toEqual([]);
    } finally {
      await pool.query(`delete from homes where address_key like 'DOOMED-B|%'`);
      await pool.query(`delete from builders where id = $1`, [builder.id]);
    }
  });

  it('takes a deleted community off its homes and its plan off the map', async () => {
    const pool = app.database.pool;
    const companyId = await company();
    const editor = new ApiClient(app.url);
    await editor.signIn(demoUser('estimator'));
    const { rows: [community] } = await pool.query(
      `insert into communities (company_id, name) values ($1, 'Doomed Tile Phase') returning id`,
      [companyId],
    );
    try {
      await pool.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome, community_id)
         select $1, g::text, 'Doomed Row', 'Testville', 'ZZ', '00001', 'DOOMED|' || g, ST_SetSRID(ST_MakePoint($2 + g * 0.0002, $3), 4326), 'not_visited', $4
         from generate_series(1, 3) g`,
        [companyId, home.lon + 0.01, home.lat + 0.01, community.id],
      );
      const { rows: [plan] } = await pool.query(
        `insert into sampling_plans (company_id, community_id, margin_of_error, expected_rate, sample_size) values ($1, $2, 0.1, 0.3, 1) returning id`,
        [companyId, community.id],
      );
      await pool.query(`insert into sampling_plan_homes (plan_id, home_id) select $1, id from homes where address_key = 'DOOMED|2'`, [plan.id]);
      expect((await homeMapMismatches(pool)).length).toBe(0);
      expect((await editor.delete(`/api/communities/${community.id}`)).status).toBe(204);
      const { rows } = await pool.query(`select count(*)::int as n, count(community_id)::int as with_community from homes where address_key like 'DOOMED|%'`);
      expect(rows[0]).toEqual({ n: 3, with_community: 0 });
      expect((await pool.query(`select 1 from sampling_plans where id = $1`, [plan.id])).rowCount).toBe(0);
      expect(await homeMapMismatches(pool)).toEqual([]);
    } finally {
      await pool.query(`delete from homes where address_key like 'DOOMED|%'`);
      await pool.query(`delete from communities where id = $1`, [community.id]);
    }
  });
});

describe('which cached tiles a change makes stale (home_tile_versions)', () => {
  /** Longitude of a point `units` of the 4096 grid inside the east edge of tile x at zoom z (Mercator x is linear in longitude). */
  const lonInsideEastEdge = (z: number, x: number, units: number) => ((x + 1 - units / 4096) / 2 ** z) * 360 - 180;

  it('rebuilds the tiles that draw a changed home, its neighbour showing it in the margin included, and keeps the rest cached', async () => {
    const { rows: [company] } = await app.database.pool.query(`select company_id as id from users where email = $1`, [demoUser('technician')]);
    const z = HOMES_MAX_TILE_ZOOM;
    const { x, y } = tileFor(home.lon, home.lat, z);
    const lon = lonInsideEastEdge(z, x, 10);
    const { rows: [edge] } = await app.database.pool.query(
      `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome)
       values ($1, '1', 'Tile Edge Row', 'Testville', 'ZZ', '00001', 'TILE-EDGE|1', ST_SetSRID(ST_MakePoint($2, $3), 4326), 'not_visited') returning ref::int as ref`,
      [company.id, lon, home.lat],
    );
    try {
      const own = `/tiles/homes/${z}/${x}/${y}.pbf`;
      const neighbour = `/tiles/homes/${z}/${x + 1}/${y}.pbf`;
      const far = `/tiles/homes/${z}/${x + 40}/${y}.pbf`;
      const overview = (() => { const t = tileFor(lon, home.lat, HOMES_MIN_ZOOM); return `/tiles/homes/${t.z}/${t.x}/${t.y}.pbf`; })();
      for (const path of [own, neighbour, far, overview]) await fetchTile(tech, path); // built and cached
      for (const path of [own, neighbour, far, overview]) expect((await fetchTile(tech, path)).timing).toContain('cached');

      await app.database.pool.query(`update homes set outcome = 'needs_rework', rework_flag = true where ref = $1`, [edge.ref]);
      const drawnOutcome = async (path: string) => {
        const res = await fetchTile(tech, path);
        const layer = decodeTile(res.body).layers.homes;
        const f = Array.from({ length: layer.length }, (_, i) => layer.feature(i)).find((g) => g.id === edge.ref);
        return { timing: res.timing, outcome: f?.properties.outcome, point: f?.loadGeometry()[0][0] };
      };
      const ownAfter = await drawnOutcome(own);
      expect(ownAfter.timing).toContain('built');
      expect(ownAfter.outcome).toBe('needs_rework');
      const neighbourAfter = await drawnOutcome(neighbour);
      expect(neighbourAfter.timing).toContain('built');
      expect(neighbourAfter.outcome).toBe('needs_rework');
      expect(neighbourAfter.point!.x).toBeLessThan(0); // in the neighbour's margin (MVT spec 2.1 §4.3: coordinates may lie outside the extent)
      // Overview tiles are stored: encoded again by the trigger, read from home_tiles.
      expect((await fetchTile(tech, overview)).timing).toContain('stored');
      expect((await fetchTile(tech, far)).timing).toContain('cached');
      // A change to what no tile draws (the owner's name) leaves every tile cached.
      await app.database.pool.query(`update homes set owner_name = 'Tile Edge Owner' where ref = $1`, [edge.ref]);
      for (const path of [own, neighbour, overview]) expect((await fetchTile(tech, path)).timing).toContain('cached');
    } finally {
      await app.database.pool.query(`delete from homes where address_key = 'TILE-EDGE|1'`);
    }
  });

  it('versions every tile zoom the map asks for, and leaves statements of more than 2,000 homes to the company version', async () => {
    const { rows: [company] } = await app.database.pool.query(`select company_id as id, (select homes_version from companies c where c.id = u.company_id)::int as v from users u where email = $1`, [demoUser('technician')]);
    const { rows: [was] } = await app.database.pool.query(`select last_vacuum_pa from homes where id = $1`, [home.id]);
    await app.database.pool.query(`update homes set last_vacuum_pa = coalesce(last_vacuum_pa, 0) + 1 where id = $1`, [home.id]);
    try {
      const { rows: zooms } = await app.database.pool.query(
        `select distinct z from home_tile_versions where company_id = $1 and version = (select max(version) from home_tile_versions where company_id = $1) order by z`,
        [company.id],
      );
      expect(zooms.map((r) => r.z)).toEqual(Array.from({ length: HOMES_MAX_TILE_ZOOM - HOMES_MIN_ZOOM + 1 }, (_, i) => HOMES_MIN_ZOOM + i));
      await app.database.pool.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location)
         select $1, g::text, 'Bulk Row', 'Testville', 'ZZ', '00001', 'TILE-BULK|' || g, ST_SetSRID(ST_MakePoint($2 + g * 0.00001, $3), 4326) from generate_series(1, 2001) g`,
        [company.id, home.lon, home.lat],
      );
      const { rows: [after] } = await app.database.pool.query(`select homes_version::int as v from companies where id = $1`, [company.id]);
      expect(after.v).toBe(company.v + 1);
    } finally {
      await app.database.pool.query(`update homes set last_vacuum_pa = $2 where id = $1`, [home.id, was.last_vacuum_pa]);
      await app.database.pool.query(`delete from homes where address_key like 'TILE-BULK|%'`);
    }
  });
});
