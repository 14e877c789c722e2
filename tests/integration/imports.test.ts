import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import * as turf from '@turf/turf';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';
import { startFakeGeocoder, type FakeGeocoder } from '../../server/fakes/geocoder.js';
import { addressKey } from '../../shared/domain/address.js';
import { importCsv, uploadCsv, waitForImport } from './imports-support.js';
import { homeMapMismatches } from '../setup/home-cells.js';

const fixture = (name: string) => fs.readFileSync(new URL(`../fixtures/${name}`, import.meta.url));
const streets = JSON.parse(fs.readFileSync(new URL('../../data/demo/streets.geojson', import.meta.url), 'utf8')) as {
  features: { properties: { name: string }; geometry: { type: 'LineString'; coordinates: [number, number][] } }[];
};

let geocoder: FakeGeocoder;
let app: TestApp;
let estimator: ApiClient;
let companyId: string;

beforeAll(async () => {
  geocoder = await startFakeGeocoder(0);
  app = await startTestApp({ GEOCODER_URL: geocoder.url });
  estimator = new ApiClient(app.url);
  await estimator.signIn(demoUser('estimator'));
  companyId = (await app.database.pool.query('select company_id from users where email = $1', [demoUser('estimator')])).rows[0].company_id;
});
afterAll(async () => {
  await app?.close();
  await geocoder?.close();
});

/** Every stored column of the company's homes at these addresses (whole rows, as PostgreSQL has them). */
async function homesAt(keys: string[]) {
  const { rows } = await app.database.pool.query(
    `select address_key, to_jsonb(h) - 'location' as row, ST_AsEWKB(location)::text as location, ST_X(location) as lon, ST_Y(location) as lat,
            (select name from communities c where c.id = h.community_id) as community, (select name from builders b where b.id = h.builder_id) as builder
       from homes h where company_id = $1 and address_key = any($2) order by address_key`,
    [companyId, keys],
  );
  return rows as { address_key: string; row: Record<string, unknown>; location: string; lon: number; lat: number; community: string | null; builder: string | null }[];
}

const keyOf = (number: string, street: string, zip: string) => addressKey({ number, street, zip });
const CLEAN_KEYS = [
  keyOf('389', 'Aster St', '00090'), keyOf('415', 'Aster St', '00090'), keyOf('441', 'Aster St', '00090'),
  keyOf('389', 'Harrier Ridge Dr', '00090'), keyOf('415', 'Harrier Ridge Dr', '00090'),
  keyOf('1121', 'Tamarack Bend Dr', '00090'), keyOf('1147', 'Tamarack Bend Dr', '00090'),
  keyOf('1189', 'Sedgefield Dr', '00090'), keyOf('1215', 'Sedgefield Dr', '00090'),
  keyOf('1989', 'Fennel Creek Dr', '00091'), keyOf('2015', 'Fennel Creek Dr', '00091'), keyOf('1989', 'Copperleaf Dr', '00091'),
];

describe('importing a clean file, then re-importing a changed copy, then undoing both', () => {
  let firstId: string;
  let afterFirst: Awaited<ReturnType<typeof homesAt>>;

  it('inserts every row, geocoded onto its street, with community, builder and the not-visited outcome', async () => {
    const { started, job } = await importCsv(estimator, fixture('addresses-clean.csv'), { fileName: 'addresses-clean.csv' });
    expect(started.status).toBe(202);
    firstId = started.id;
    expect(job.status).toBe('committed');
    expect(job.counts).toEqual({ rows: 12, inserted: 12, updated: 0, unchanged: 0, rejected: 0 });
    expect(job.errors).toEqual([]);
    expect(job.progress).toMatchObject({ rowsParsed: 12, rowsWritten: 12 });

    afterFirst = await homesAt(CLEAN_KEYS);
    // The map's overview cells, refreshed once at the end of the import's transaction, match the homes.
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
    expect(afterFirst).toHaveLength(12);
    const byKey = new Map(afterFirst.map((h) => [h.address_key, h]));
    for (const h of afterFirst) expect(h.row.outcome).toBe('not_visited');

    // Written in the Pub 28 display form, whatever the file's spelling ("441 aster st", "TARROWBY", "zz").
    const aster441 = byKey.get(keyOf('441', 'Aster St', '00090'))!;
    expect(aster441.row).toMatchObject({ number: '441', street: 'Aster St', city: 'Tarrowby', state: 'ZZ', zip: '00090', foundation: 'basement' });
    // No community in the row: assigned by the boundary it lies in, and the builder comes from that community.
    expect(aster441.community).toBe('Larkspur Meadows');
    expect(aster441.builder).toBe('Ansel & Vary Construction');
    // Named community and no builder: the community's only builder; its years span 2005–2007, so no year is invented.
    const tamarack = byKey.get(keyOf('1121', 'Tamarack Bend Dr', '00090'))!;
    expect(tamarack).toMatchObject({ community: 'Tamarack Bend Phase 1', builder: 'Brackwell Homes' });
    expect(tamarack.row.year_built).toBeNull();
    // Copperleaf Estates has two builders: the row says Pellow.
    expect(byKey.get(keyOf('1989', 'Copperleaf Dr', '00091'))!.builder).toBe('Pellow Custom Homes');
    expect(byKey.get(keyOf('1147', 'Tamarack Bend Dr', '00090'))!.row.do_not_contact).toBe(true);

    // Each home sits about 15 m off its street's centreline (range geocoding, data/README.md), measured with turf.
    for (const h of afterFirst) {
      const street = h.row.street as string;
      const lines = streets.features.filter((f) => f.properties.name === street);
      const miss = Math.min(...lines.map((l) => turf.pointToLineDistance([h.lon, h.lat], l.geometry, { units: 'meters' })));
      expect(miss, street).toBeGreaterThan(13);
      expect(miss, street).toBeLessThan(17);
    }
  });

  it('remembers the mapping for the next file with the same headers', async () => {
    const headers = fixture('addresses-clean.csv').toString().split('\n')[0].split(',');
    const res = await estimator.post('/api/imports/mapping-suggestions', { headers });
    expect(res.status).toBe(200);
    expect(res.body.source).toBe('remembered');
    expect(res.body.mapping).toMatchObject({ address: 'Street Address', community: 'Subdivision', ownerName: 'Owner Name' });
    const fresh = await estimator.post('/api/imports/mapping-suggestions', { headers: ['Site Address', 'Town', 'Zip', 'St'] });
    expect(fresh.body).toEqual({ source: 'guessed', mapping: { address: 'Site Address', city: 'Town', zip: 'Zip', state: 'St' } });
  });

  let secondId: string;
  it('updates the 3 changed rows on re-import, leaves the rest unchanged and adds no duplicates', async () => {
    const { started, job } = await importCsv(estimator, fixture('addresses-reimport.csv'), { fileName: 'addresses-reimport.csv' });
    secondId = started.id;
    expect(job.counts).toEqual({ rows: 12, inserted: 0, updated: 3, unchanged: 9, rejected: 0 });
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
    const after = await homesAt(CLEAN_KEYS);
    expect(after).toHaveLength(12);
    const { rows } = await app.database.pool.query(
      `select count(*)::int as n, count(distinct address_key)::int as keys from homes where company_id = $1 and address_key = any($2)`,
      [companyId, CLEAN_KEYS],
    );
    expect(rows[0]).toEqual({ n: 12, keys: 12 });
    const byKey = new Map(after.map((h) => [h.address_key, h]));
    expect(byKey.get(keyOf('415', 'Aster St', '00090'))!.row.owner_name).toBe('Imogen Wrenfield');
    expect(byKey.get(keyOf('1121', 'Tamarack Bend Dr', '00090'))!.row.year_built).toBe(2007);
    expect(byKey.get(keyOf('1215', 'Sedgefield Dr', '00090'))!.row.do_not_contact).toBe(true);
    // Unchanged homes were not written at all.
    const before = new Map(afterFirst.map((h) => [h.address_key, h]));
    expect(byKey.get(CLEAN_KEYS[0])!.row.updated_at).toBe(before.get(CLEAN_KEYS[0])!.row.updated_at);
  });

  it('refuses to undo while a visit recorded since the import would be lost', async () => {
    const home = (await homesAt([keyOf('415', 'Aster St', '00090')]))[0];
    const visitId = randomUUID();
    await app.database.pool.query(`insert into visits (id, company_id, home_id, visited_on, status) values ($1, $2, $3, current_date, 'declined')`, [
      visitId,
      companyId,
      home.row.id,
    ]);
    const res = await estimator.post(`/api/imports/${secondId}/undo`);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/1 home has a visit recorded since the import \(e\.g\. 415 Aster St\)/);
    // The first import is blocked too: a later import changed its homes.
    const first = await estimator.post(`/api/imports/${firstId}/undo`);
    expect(first.status).toBe(409);
    expect(first.body.error.message).toMatch(/later import \("addresses-reimport\.csv"\).*undo that one first/);
    await app.database.pool.query('delete from visits where id = $1', [visitId]);
  });

  it('refuses to undo when a visit to one of its homes commits while the undo waits', async () => {
    const home = (await homesAt([keyOf('415', 'Aster St', '00090')]))[0];
    const visitId = randomUUID();
    const visiting = await app.database.pool.connect();
    try {
      // As a visit is recorded: the home locked (homes.repository lockHome), then the visit written.
      await visiting.query('begin');
      await visiting.query(`select id from homes where id = $1 for no key update`, [home.row.id]);
      await visiting.query(`insert into visits (id, company_id, home_id, visited_on, status) values ($1, $2, $3, current_date, 'declined')`, [visitId, companyId, home.row.id]);
      const undo = estimator.post(`/api/imports/${secondId}/undo`);
      await new Promise((resolve) => setTimeout(resolve, 300));
      await visiting.query('commit');
      const res = await undo;
      expect(res.status).toBe(409);
      expect(res.body.error.message).toMatch(/1 home has a visit recorded since the import \(e\.g\. 415 Aster St\)/);
    } finally {
      await visiting.query('rollback').catch(() => undefined);
      visiting.release();
      await app.database.pool.query('delete from visits where id = $1', [visitId]);
    }
  });

  it('undo restores the previous state exactly: updated rows back as they were, inserted rows gone', async () => {
    const undo = await estimator.post(`/api/imports/${secondId}/undo`);
    expect(undo.status).toBe(200);
    expect(undo.body.import.status).toBe('undone');
    expect(undo.body.import.undoneAt).not.toBeNull();
    // Whole rows, every column including updated_at and the exact geometry bytes.
    expect(await homesAt(CLEAN_KEYS)).toEqual(afterFirst);
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
    expect((await estimator.post(`/api/imports/${secondId}/undo`)).status).toBe(409);

    const undoFirst = await estimator.post(`/api/imports/${firstId}/undo`);
    expect(undoFirst.status).toBe(200);
    expect(await homesAt(CLEAN_KEYS)).toEqual([]);
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);

    const history = await estimator.get('/api/imports');
    const entries = history.body.imports.filter((i: { id: string }) => i.id === firstId || i.id === secondId);
    const estimatorName = (await app.database.pool.query('select name from users where email = $1', [demoUser('estimator')])).rows[0].name;
    expect(entries.map((i: { fileName: string; status: string; userName: string }) => [i.fileName, i.status, i.userName])).toEqual([
      ['addresses-reimport.csv', 'undone', estimatorName],
      ['addresses-clean.csv', 'undone', estimatorName],
    ]);
  });
});

describe('file formats', () => {
  it('reads a UTF-8 file with a BOM, semicolons, comma decimals and quoted newlines', async () => {
    const { job } = await importCsv(estimator, fixture('addresses-bom-semicolon.csv'), { fileName: 'addresses-bom-semicolon.csv' });
    expect(job.errors).toEqual([]);
    expect(job.counts).toEqual({ rows: 6, inserted: 6, updated: 0, unchanged: 0, rejected: 0 });
    const [zoe] = await homesAt([keyOf('1989', 'Fennel Ridge Dr', '00091')]);
    // The BOM is not part of the first header ("Address" mapped), UTF-8 names survive, "41,188181" is 41.188181.
    expect(zoe.row.owner_name).toBe('Zoë Ångström');
    expect(zoe.row.mailing_address).toBe('PO Box 7; Tarrowby ZZ 00091');
    expect([zoe.lon, zoe.lat]).toEqual([-96.618982, 41.188181]);
    expect(zoe.community).toBe('Fennel Creek North');
    const [moreau] = await homesAt([keyOf('2041', 'Copperleaf Dr', '00091')]);
    expect(moreau.row.owner_name).toBe('Moreau, Baptiste');
    const [ashby] = await homesAt([keyOf('2067', 'Fennel Ridge Dr', '00091')]);
    expect(ashby.row.mailing_address).toBe('c/o Ashby 12 Quay St Port Selden ZZ 00095');
  });

  it('names the missing required columns and saves nothing', async () => {
    const before = (await app.database.pool.query('select count(*)::int as n from import_batches')).rows[0].n;
    const res = await uploadCsv(estimator, fixture('addresses-missing-columns.csv'), { fileName: 'addresses-missing-columns.csv' });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe('The file has no column for City and ZIP: add these columns or map other columns to them');
    expect(res.body.error.fields).toEqual([
      { field: 'city', message: 'no column for City (required)' },
      { field: 'zip', message: 'no column for ZIP (required)' },
    ]);
    expect((await app.database.pool.query('select count(*)::int as n from import_batches')).rows[0].n).toBe(before);
    // The failed job answers the poll with the same reason.
    const polled = await estimator.get(`/api/imports/${res.id}`);
    expect(polled.body.import).toMatchObject({ status: 'failed', failure: { code: 'UNPROCESSABLE' } });
  });

  it('refuses a mapping to a column the file does not have, naming it', async () => {
    const res = await uploadCsv(estimator, fixture('addresses-clean.csv'), {
      mapping: { address: 'Street Address', city: 'City', state: 'State', zip: 'Postcode' },
    });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toEqual([{ field: 'zip', message: 'the file has no column "Postcode" (mapped to ZIP)' }]);
  });

  it('refuses a body that is not sent as CSV', async () => {
    const res = await uploadCsv(estimator, '{}', { contentType: 'application/json' });
    expect(res.status).toBe(415);
  });
});

describe('a file with good and bad rows', () => {
  let jobId: string;
  it('imports the good rows and reports each bad one with its spreadsheet row, column and reason', async () => {
    const { started, job } = await importCsv(estimator, fixture('addresses-mixed.csv'), { fileName: 'addresses-mixed.csv' });
    jobId = started.id;
    expect(job.status).toBe('committed');
    // 14 lines below the header, one of them blank.
    expect(job.counts).toEqual({ rows: 13, inserted: 4, updated: 0, unchanged: 0, rejected: 9 });
    const errors = job.errors as { row: number; field: string; reason: string }[];
    const at = (row: number) => errors.filter((e) => e.row === row);
    expect(at(3)).toEqual([{ row: 3, field: 'ZIP', reason: '"ABCDE" is not a 5-digit ZIP or ZIP+4' }]);
    expect(at(4)).toEqual([{ row: 4, field: 'Year Built', reason: expect.stringMatching(/^3020 is outside 1800–\d{4}$/) }]);
    expect(at(5)).toEqual([{ row: 5, field: 'Address', reason: expect.stringMatching(/^the geocoder found no match for "12 Nowhere Ln, Tarrowby, ZZ 00090"/) }]);
    expect(at(6)).toEqual([{ row: 6, field: 'Address', reason: expect.stringMatching(/^the geocoder found several places for "1189 Tamarack/) }]);
    expect(at(7)).toEqual([{ row: 7, field: 'Community', reason: 'the address lies in "Sedgefield Commons", not "Fennel Creek": check the community or the address' }]);
    expect(at(8)).toEqual([{ row: 8, field: 'Address', reason: 'the same address as row 2' }]);
    expect(at(9)).toEqual([{ row: 9, field: 'Builder', reason: '"Nonesuch Builders" is not one of your builders: fix the name, or confirm creating new builders' }]);
    expect(at(10)).toEqual([{ row: 10, field: 'Longitude', reason: 'the longitude is empty but the latitude is not' }]);
    expect(at(11)).toEqual([]); // the blank line
    expect(at(14)).toEqual([{ row: 14, field: 'Community', reason: '"Copperleaf Estates West" is not one of your communities: fix the name, or confirm creating new communities' }]);
    expect(job.errorCount).toBe(9);

    const good = await homesAt([
      keyOf('441', 'Harrier Ridge Dr', '00090'), keyOf('493', 'Aster St', '00090'), keyOf('1267', 'Sedgefield Dr', '00090'), keyOf('2093', 'Copperleaf Dr', '00091'),
    ]);
    expect(good).toHaveLength(4);
    // Coordinates from the file are used as given, not geocoded.
    const aster = good.find((h) => h.row.number === '493')!;
    expect([aster.lon, aster.lat]).toEqual([-96.636815, 41.180747]);
  });

  it('stores a cell that starts with =, +, - or @ as plain text', async () => {
    const [harrier] = await homesAt([keyOf('441', 'Harrier Ridge Dr', '00090')]);
    expect(harrier.row.owner_name).toBe('=1+2');
    const [aster] = await homesAt([keyOf('493', 'Aster St', '00090')]);
    expect(aster.row.owner_name).toBe('@home trust');
    const api = await estimator.get(`/api/homes/${harrier.row.id}`);
    expect(api.body.home.contact.ownerName).toBe('=1+2');
  });

  it('offers the bad rows as a CSV to fix, with formula cells neutralised (OWASP CSV injection)', async () => {
    const res = await fetch(`${app.url}/api/imports/${jobId}/errors.csv`, { headers: { Cookie: estimator.cookie } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toBe('attachment; filename="addresses-mixed-errors.csv"');
    const bytes = Buffer.from(await res.arrayBuffer());
    // A UTF-8 byte order mark first, so spreadsheets read the names as UTF-8.
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = bytes.subarray(3).toString('utf8');
    const rows = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(['Address', 'City', 'State', 'ZIP', 'Latitude', 'Longitude', 'Year Built', 'Builder', 'Community', 'Owner', 'Do Not Contact', 'Import row', 'Import problems']);
    expect(rows).toHaveLength(10);
    const byRow = new Map(rows.slice(1).map((r) => [r[11], r]));
    expect([...byRow.keys()]).toEqual(['3', '4', '5', '6', '7', '8', '9', '10', '14']);
    // OWASP: prefix = + - @ with a single quote so a spreadsheet shows text instead of running a formula.
    expect(byRow.get('3')![9]).toBe("'@SUM(1+2)");
    expect(byRow.get('4')![9]).toBe("'+1 555 0100");
    expect(byRow.get('5')![9]).toBe("'-2+3");
    expect(byRow.get('3')![12]).toBe('ZIP: "ABCDE" is not a 5-digit ZIP or ZIP+4');
    // A plain negative number is not a formula: the longitude of row 10 was empty, the latitude stays numeric.
    expect(byRow.get('10')![4]).toBe('41.181060');
    // Every field is quoted (RFC 4180), so an embedded delimiter cannot start a new cell.
    expect(text.split('\r\n')[1].startsWith('"467 Harrier Ridge Dr","Tarrowby"')).toBe(true);
  });

  it('creates new builders and communities only when the user confirmed it, and undo removes them again', async () => {
    const csv = 'Address,City,State,ZIP,Builder,Community\n2119 Copperleaf Dr,Tarrowby,ZZ,00091,Quarrystone Builders,\n2171 Fennel Ridge Dr,Tarrowby,ZZ,00091,Quarrystone Builders,\n';
    const { started, job } = await importCsv(estimator, csv, { createBuilders: true });
    expect(job.counts).toMatchObject({ inserted: 2, rejected: 0 });
    expect(job.created).toEqual({ builders: ['Quarrystone Builders'], communities: [] });
    const builders = await app.database.pool.query(`select id from builders where company_id = $1 and name = 'Quarrystone Builders'`, [companyId]);
    expect(builders.rows).toHaveLength(1);
    expect((await estimator.post(`/api/imports/${started.id}/undo`)).status).toBe(200);
    expect((await app.database.pool.query(`select id from builders where company_id = $1 and name = 'Quarrystone Builders'`, [companyId])).rows).toEqual([]);
  });

  it('keeps a builder the import created when a home written during the undo refers to it, without deadlock', async () => {
    const csv = 'Address,City,State,ZIP,Builder\n2207 Copperleaf Dr,Tarrowby,ZZ,00091,Larkspur Homebuilders\n';
    const { started, job } = await importCsv(estimator, csv, { createBuilders: true });
    expect(job.created.builders).toEqual(['Larkspur Homebuilders']);
    const { rows: [builder] } = await app.database.pool.query(`select id from builders where company_id = $1 and name = 'Larkspur Homebuilders'`, [companyId]);
    const writing = await app.database.pool.connect();
    try {
      // A home written by someone else that names the new builder: its foreign key holds the builder
      // (key share) before its trigger asks for the map's lock, which the undo must not hold meanwhile.
      await writing.query('begin');
      await writing.query(`select id from builders where id = $1 for key share`, [builder.id]);
      const undo = estimator.post(`/api/imports/${started.id}/undo`);
      await new Promise((resolve) => setTimeout(resolve, 300));
      await writing.query(
        `insert into homes (company_id, number, street, city, state, zip, address_key, location, outcome, builder_id)
         select company_id, '9', 'Undo Race Ct', 'Tarrowby', 'ZZ', '00091', 'UNDO-RACE|9', location, 'not_visited', $2 from homes where company_id = $1 limit 1`,
        [companyId, builder.id],
      );
      await writing.query('commit');
      expect((await undo).status).toBe(200);
      // Still referred to, so kept.
      expect((await app.database.pool.query(`select id from builders where id = $1`, [builder.id])).rows).toHaveLength(1);
    } finally {
      await writing.query('rollback').catch(() => undefined);
      writing.release();
      await app.database.pool.query(`delete from homes where address_key = 'UNDO-RACE|9'`);
      await app.database.pool.query(`delete from builders where id = $1`, [builder.id]);
    }
  });
});

describe('submitting', () => {
  it('answers a double submit with the same job instead of importing twice', async () => {
    const id = randomUUID();
    const csv = 'Address,City,State,ZIP\n2145 Copperleaf Dr,Tarrowby,ZZ,00091\n2171 Copperleaf Dr,Tarrowby,ZZ,00091\n';
    const [a, b] = await Promise.all([uploadCsv(estimator, csv, { id }), uploadCsv(estimator, csv, { id })]);
    expect([a.status, b.status].sort()).toEqual([200, 202]);
    expect(a.body.import.id).toBe(id);
    expect(b.body.import.id).toBe(id);
    const job = await waitForImport(estimator, id);
    expect(job.counts).toMatchObject({ inserted: 2 });
    const again = await uploadCsv(estimator, csv, { id });
    expect(again.status).toBe(200);
    expect(again.body.import).toMatchObject({ id, status: 'committed', counts: { inserted: 2, updated: 0, unchanged: 0 } });
    const { rows } = await app.database.pool.query('select count(*)::int as n from import_batches where id = $1', [id]);
    expect(rows[0].n).toBe(1);
  });

  it('lets admins, managers and estimators import; technicians and sales may not; other companies see nothing', async () => {
    const csv = 'Address,City,State,ZIP\n2197 Copperleaf Dr,Tarrowby,ZZ,00091\n';
    for (const role of ['technician', 'sales'] as const) {
      const c = new ApiClient(app.url);
      await c.signIn(demoUser(role));
      expect((await uploadCsv(c, csv)).status, role).toBe(403);
      expect((await c.get('/api/imports')).status, role).toBe(403);
    }
    const manager = new ApiClient(app.url);
    await manager.signIn(demoUser('manager'));
    const { started, job } = await importCsv(manager, csv);
    expect(job.status).toBe('committed');
    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    expect((await other.get(`/api/imports/${started.id}`)).status).toBe(404);
    expect((await other.post(`/api/imports/${started.id}/undo`)).status).toBe(404);
    expect((await fetch(`${app.url}/api/imports/${started.id}/errors.csv`, { headers: { Cookie: other.cookie } })).status).toBe(404);
    expect((await other.get('/api/imports')).body.imports.some((i: { id: string }) => i.id === started.id)).toBe(false);
    // The same import id from another company is refused, not merged.
    expect((await uploadCsv(other, csv, { id: started.id })).status).toBe(409);
  });

  it('needs the CSRF token', async () => {
    const c = new ApiClient(app.url);
    await c.signIn(demoUser('estimator'));
    c.csrfToken = null;
    expect((await uploadCsv(c, 'Address,City,State,ZIP\n')).status).toBe(403);
  });
});

describe('limits and failures', () => {
  let small: TestApp;
  let client: ApiClient;
  beforeAll(async () => {
    small = await startTestApp({ GEOCODER_URL: 'http://127.0.0.1:9/geocode', IMPORT_MAX_BYTES: '2048', IMPORT_MAX_ROWS: '5' });
    client = new ApiClient(small.url);
    await client.signIn(demoUser('estimator'));
  });
  afterAll(() => small.close());

  it('refuses a file over the size limit with a clear error', async () => {
    const big = 'Address,City,State,ZIP\n' + '1 Sorrel Rd,Tarrowby,ZZ,00090\n'.repeat(200);
    const res = await uploadCsv(client, big);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toBe('The file is larger than the import limit of 2 KB: split it into smaller files');
  });

  it('refuses a file over the row limit with a clear error', async () => {
    const rows = 'Address,City,State,ZIP\n' + Array.from({ length: 6 }, (_, i) => `${301 + 2 * i} Sorrel Rd,Tarrowby,ZZ,00090\n`).join('');
    const res = await uploadCsv(client, rows);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toBe('The file has more than 5 data rows, the import limit: split it into smaller files');
  });

  it('stops with a clear message and writes nothing when the geocoder cannot be reached', async () => {
    const csv = 'Address,City,State,ZIP\n2223 Copperleaf Dr,Tarrowby,ZZ,00091\n';
    const { job } = await importCsv(client, csv);
    expect(job.status).toBe('failed');
    expect(job.failure.message).toMatch(/^the geocoder at http:\/\/127\.0\.0\.1:9\/geocode did not answer .*add latitude and longitude columns, or try again later\. Nothing was imported\.$/);
    expect(await homesAt([keyOf('2223', 'Copperleaf Dr', '00091')])).toEqual([]);
  });
});
