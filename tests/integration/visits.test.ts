// Field visits, radon tests and their files over HTTP, against the real PostgreSQL and an
// in-process S3 fake. Every check names where its expected value comes from.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';
import { decodeTile, tileFor } from '../setup/tiles.js';
import { homeMapMismatches } from '../setup/home-cells.js';
import { startFakeS3, type FakeS3 } from '../../server/fakes/s3.js';

let s3: FakeS3;
let app: TestApp;
let tech: ApiClient;
let admin: ApiClient;
let other: ApiClient;
let fanId: string;
let otherCompanyFanId: string;
let otherCompanyHomeId: string;

const HOUR = 3_600_000;
/** NIST SP 811 (2008) Appendix B.8: inch of water, conventional = 249.0889 Pa. */
const PA_PER_IN_WC = 249.0889;
/** Definition of the curie (1 Ci = 3.7×10¹⁰ Bq): 1 pCi/L = 0.037 Bq / 0.001 m³ = 37 Bq/m³. */
const BQ_M3_PER_PCI_L = 37;

let seq = 0;
/** A home of the demo company away from every community, so these records move no community statistics. */
async function newHome(): Promise<{ id: string; ref: number; lon: number; lat: number }> {
  const lon = 10.2 + (seq % 50) * 0.0005;
  const lat = 10.2;
  const res = await admin.post('/api/homes', { number: String(61000 + seq++), street: 'Field Visit Way', city: 'Testville', state: 'ZZ', zip: '00001', lon, lat });
  expect(res.status).toBe(201);
  return { id: res.body.home.id, ref: res.body.home.ref, lon, lat };
}

const isoDaysAgo = (days: number) => new Date(Date.now() - days * 24 * HOUR).toISOString();
const dateDaysAgo = (days: number) => isoDaysAgo(days).slice(0, 10);

function visitBody(overrides: Record<string, unknown> = {}) {
  return {
    id: randomUUID(),
    visitedOn: dateDaysAgo(10),
    status: 'completed',
    fanId,
    fanLocation: 'Attic',
    fanActivatedAt: isoDaysAgo(10),
    vacuumInWc: 1.2,
    pipeSizeIn: 3,
    pipeLengthFt: 30,
    elbows: 3,
    subSlabMaterial: 'clean_gravel',
    ...overrides,
  };
}

function testBody(overrides: Record<string, unknown> = {}) {
  return {
    id: randomUUID(),
    kind: 'post',
    device: 'charcoal',
    startedAt: isoDaysAgo(5),
    endedAt: isoDaysAgo(2),
    result: 2,
    unit: 'pCi/L',
    ...overrides,
  };
}

async function count(table: 'visits' | 'radon_tests' | 'attachments', where = 'true', params: unknown[] = []) {
  const { rows } = await app.database.pool.query(`select count(*)::int as n from ${table} where ${where}`, params);
  return rows[0].n as number;
}

/** A real photo made in the test: a 640 × 480 colour gradient. */
async function photo(format: 'jpeg' | 'png'): Promise<Uint8Array<ArrayBuffer>> {
  const width = 640;
  const height = 480;
  const pixels = Buffer.alloc(width * height * 3);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 3;
      pixels[i] = (x * 255) / width;
      pixels[i + 1] = (y * 255) / height;
      pixels[i + 2] = 128;
    }
  }
  const image = sharp(pixels, { raw: { width, height, channels: 3 } });
  return new Uint8Array(await (format === 'jpeg' ? image.jpeg({ quality: 80 }) : image.png()).toBuffer());
}

const uploadPath = (homeId: string, attachmentId: string, query: string) => `/api/homes/${homeId}/attachments/${attachmentId}?${query}`;

async function readAll(stream: NodeJS.ReadableStream) {
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(c as Buffer);
  return Buffer.concat(chunks);
}

beforeAll(async () => {
  s3 = await startFakeS3(0);
  app = await startTestApp({ S3_ENDPOINT: s3.url });
  tech = new ApiClient(app.url);
  await tech.signIn(demoUser('technician'));
  admin = new ApiClient(app.url);
  await admin.signIn(demoUser('admin'));
  other = new ApiClient(app.url);
  await other.signIn(otherCompanyUser('admin'));
  fanId = (await tech.get('/api/fans')).body.fans[0].id;
  otherCompanyFanId = (await other.get('/api/fans')).body.fans[0].id;
  otherCompanyHomeId = (await other.get('/api/homes?limit=1')).body.homes[0].id;
});
afterAll(async () => {
  await app?.close();
  await s3?.close();
});

describe('fans', () => {
  it('lists the company’s fans to every signed-in role and only its own', async () => {
    const mine = (await tech.get('/api/fans')).body.fans.map((f: { id: string }) => f.id);
    expect(mine.length).toBeGreaterThan(0);
    expect(mine).not.toContain(otherCompanyFanId);
  });

  it('lets an admin add and edit a fan, keeping the curve in flow order with its maximum static pressure', async () => {
    // An invented curve (demo data), realistic in shape: static pressure falls as flow rises.
    const curve = [
      { flowCfm: 80, staticInWc: 0.9 },
      { flowCfm: 0, staticInWc: 2.1 },
      { flowCfm: 40, staticInWc: 1.6 },
    ];
    const created = await admin.post('/api/fans', { name: `Test fan ${randomUUID().slice(0, 8)}`, curve });
    expect(created.status).toBe(201);
    expect(created.body.fan.maxStaticInWc).toBe(2.1);
    expect(created.body.fan.curve.map((p: { flowCfm: number }) => p.flowCfm)).toEqual([0, 40, 80]);
    const edited = await admin.request('PUT', `/api/fans/${created.body.fan.id}`, { name: created.body.fan.name, curve: [{ flowCfm: 0, staticInWc: 3 }, { flowCfm: 100, staticInWc: 0 }] });
    expect(edited.status).toBe(200);
    expect(edited.body.fan.maxStaticInWc).toBe(3);
    expect((await tech.post('/api/fans', { name: 'Not mine to add', curve })).status).toBe(403);
    expect((await other.request('PUT', `/api/fans/${created.body.fan.id}`, { name: 'x', curve })).status).toBe(404);
  });

  it('refuses a second fan of the same name, naming the field', async () => {
    const name = (await tech.get('/api/fans')).body.fans[0].name;
    const res = await admin.post('/api/fans', { name: name.toUpperCase(), curve: [{ flowCfm: 0, staticInWc: 1 }, { flowCfm: 50, staticInWc: 0 }] });
    expect(res.status).toBe(409);
    expect(res.body.error.fields[0].field).toBe('name');
  });
});

describe('recording a visit', () => {
  it('stores a completed visit in Pa and moves the home from not visited to awaiting its post test, then by the post test', async () => {
    const home = await newHome();
    expect((await tech.get(`/api/homes/${home.id}`)).body.home.outcome).toBe('not_visited');

    const body = visitBody({
      pressureField: [
        { distanceFt: 10, differential: 0.02, unit: 'in_wc' },
        { distanceFt: 25, differential: 3.5, unit: 'Pa' },
      ],
    });
    const res = await tech.post(`/api/homes/${home.id}/visits`, body);
    expect(res.status).toBe(201);
    // NIST SP 811 B.8: 1.2 in. WC × 249.0889 Pa = 298.90668 Pa.
    expect(res.body.visit.vacuumPa).toBeCloseTo(1.2 * PA_PER_IN_WC, 6);
    expect(res.body.visit.pressureField).toEqual([
      { distanceFt: 10, differentialPa: expect.closeTo(0.02 * PA_PER_IN_WC, 6) }, // NIST SP 811 B.8
      { distanceFt: 25, differentialPa: 3.5 }, // already in Pa: stored as entered
    ]);
    expect(res.body.visit.fanName).toBeTruthy();
    expect(res.body.visit.technicianName).toBeTruthy();
    const { rows } = await app.database.pool.query('select vacuum_pa, technician_id from visits where id = $1', [body.id]);
    expect(rows[0].vacuum_pa).toBeCloseTo(298.90668, 6); // NIST SP 811 B.8, worked by hand
    // A completed activation with no post-mitigation test yet waits for one (PRODUCT.md outcome list).
    expect(res.body.home.outcome).toBe('awaiting_test');
    expect((await tech.get(`/api/homes/${home.id}`)).body.home.outcome).toBe('awaiting_test');
    const { rows: summary } = await app.database.pool.query('select outcome, last_vacuum_pa, sampled from homes where id = $1', [home.id]);
    expect(summary[0]).toMatchObject({ outcome: 'awaiting_test', sampled: true });
    expect(summary[0].last_vacuum_pa).toBeCloseTo(1.2 * PA_PER_IN_WC, 6);

    // 2 pCi/L is below EPA's action level of 4 pCi/L (EPA, A Citizen's Guide to Radon, 402/K-12/002).
    const below = await tech.post(`/api/homes/${home.id}/radon-tests`, testBody({ startedAt: isoDaysAgo(8), endedAt: isoDaysAgo(5), result: 2 }));
    expect(below.status).toBe(201);
    expect((await tech.get(`/api/homes/${home.id}`)).body.home.outcome).toBe('below_action_level');

    // A later post test at 6 pCi/L is at or above the action level (EPA, A Citizen's Guide to Radon): rework.
    const above = await tech.post(`/api/homes/${home.id}/radon-tests`, testBody({ startedAt: isoDaysAgo(4), endedAt: isoDaysAgo(1), result: 6 }));
    expect(above.status).toBe(201);
    const detail = (await tech.get(`/api/homes/${home.id}`)).body;
    expect(detail.home.outcome).toBe('needs_rework');
    expect(detail.visits).toHaveLength(1);
    expect(detail.visits[0]).toMatchObject({ id: body.id, fanId, attachments: [] });
    expect(detail.tests.map((t: { resultBqM3: number }) => t.resultBqM3)).toEqual([6 * BQ_M3_PER_PCI_L, 2 * BQ_M3_PER_PCI_L]); // curie definition

    // The map draws it from the same row on the very next tile request.
    const { z, x, y } = tileFor(home.lon, home.lat, 15);
    const tileRes = await fetch(`${app.url}/tiles/homes/${z}/${x}/${y}.pbf`, { headers: { Cookie: tech.cookie } });
    expect(tileRes.headers.get('cache-control')).toContain('no-cache');
    const layer = decodeTile(new Uint8Array(await tileRes.arrayBuffer())).layers.homes;
    const outcomes = new Map<unknown, unknown>();
    for (let i = 0; i < layer.length; i++) outcomes.set(layer.feature(i).id, layer.feature(i).properties.outcome);
    expect(outcomes.get(home.ref)).toBe('needs_rework');
    // So do the stored tiles (zooms 11 to 14) and overview cells, re-encoded when the visit and tests were written.
    const stored = tileFor(home.lon, home.lat, 14);
    const storedRes = await fetch(`${app.url}/tiles/homes/${stored.z}/${stored.x}/${stored.y}.pbf`, { headers: { Cookie: tech.cookie } });
    const storedLayer = decodeTile(new Uint8Array(await storedRes.arrayBuffer())).layers.homes;
    const drawn = Array.from({ length: storedLayer.length }, (_, i) => storedLayer.feature(i)).find((f) => f.id === home.ref);
    expect(drawn?.properties.outcome).toBe('needs_rework');
    expect(await homeMapMismatches(app.database.pool)).toEqual([]);
  });

  it('stores a visit sent twice with the same id once, answering the retry with 200 and the same visit', async () => {
    const home = await newHome();
    const body = visitBody();
    const first = await tech.post(`/api/homes/${home.id}/visits`, body);
    const second = await tech.post(`/api/homes/${home.id}/visits`, body);
    expect(first.status).toBe(201);
    expect(second.status).toBe(200);
    expect(second.body.visit).toEqual(first.body.visit);
    expect(second.body.home.outcome).toBe(first.body.home.outcome);
    expect(await count('visits', 'id = $1', [body.id])).toBe(1);
  });

  it('refuses a visit id already used at another home or by another company (409) and stores nothing', async () => {
    const [a, b] = [await newHome(), await newHome()];
    const body = visitBody();
    expect((await tech.post(`/api/homes/${a.id}/visits`, body)).status).toBe(201);
    const elsewhere = await tech.post(`/api/homes/${b.id}/visits`, body);
    expect(elsewhere.status).toBe(409);
    expect(elsewhere.body.error.fields[0].field).toBe('id');
    expect((await other.post(`/api/homes/${otherCompanyHomeId}/visits`, { ...body, fanId: null })).status).toBe(409);
    expect(await count('visits', 'id = $1', [body.id])).toBe(1);
    expect(await count('visits', 'home_id = $1', [b.id])).toBe(0);
  });

  it("answers 404 for another company's home and 403 for roles that do not record visits", async () => {
    expect((await tech.post(`/api/homes/${otherCompanyHomeId}/visits`, visitBody())).status).toBe(404);
    const sales = new ApiClient(app.url);
    await sales.signIn(demoUser('sales'));
    const home = await newHome();
    expect((await sales.post(`/api/homes/${home.id}/visits`, visitBody())).status).toBe(403);
    expect((await new ApiClient(app.url).post(`/api/homes/${home.id}/visits`, visitBody())).status).toBe(401);
  });
});

describe('rejecting bad field records, with the field named and nothing saved', () => {
  let home: { id: string };
  beforeAll(async () => {
    home = await newHome();
  });

  const cases: { name: string; body: () => Record<string, unknown>; status: number; field: string }[] = [
    // A manometer vacuum is entered as a positive magnitude (the form's rule, shared/schemas/visits.ts).
    { name: 'a negative vacuum', body: () => visitBody({ vacuumInWc: -0.5 }), status: 400, field: 'vacuumInWc' },
    { name: 'an unknown fan', body: () => visitBody({ fanId: randomUUID() }), status: 400, field: 'fanId' },
    { name: "another company's fan", body: () => visitBody({ fanId: otherCompanyFanId }), status: 400, field: 'fanId' },
    { name: 'a negative pressure-field reading', body: () => visitBody({ pressureField: [{ distanceFt: 5, differential: -2, unit: 'Pa' }] }), status: 400, field: 'pressureField.0.differential' },
  ];
  for (const c of cases) {
    it(`rejects a visit with ${c.name}`, async () => {
      const before = await count('visits');
      const res = await tech.post(`/api/homes/${home.id}/visits`, c.body());
      expect(res.status).toBe(c.status);
      expect(res.body.error.fields.map((f: { field: string }) => f.field)).toContain(c.field);
      expect(await count('visits')).toBe(before);
      expect((await tech.get(`/api/homes/${home.id}`)).body.home.outcome).toBe('not_visited');
    });
  }

  it('rejects a radon test that ends before it starts', async () => {
    const before = await count('radon_tests');
    const res = await tech.post(`/api/homes/${home.id}/radon-tests`, testBody({ startedAt: isoDaysAgo(2), endedAt: isoDaysAgo(3) }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { field: string }) => f.field)).toContain('endedAt');
    expect(await count('radon_tests')).toBe(before);
  });

  it('rejects a radon test tied to a visit of another home', async () => {
    const elsewhere = await newHome();
    const visit = visitBody();
    expect((await tech.post(`/api/homes/${elsewhere.id}/visits`, visit)).status).toBe(201);
    const before = await count('radon_tests');
    const res = await tech.post(`/api/homes/${home.id}/radon-tests`, testBody({ visitId: visit.id }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].field).toBe('visitId');
    expect(await count('radon_tests')).toBe(before);
  });

  it('rejects a 30 MB photo with 413 naming the file (the limit is 15 MB)', async () => {
    const before = await count('attachments');
    const big = new Uint8Array(30 * 1024 * 1024);
    big.set([0xff, 0xd8, 0xff, 0xe0]); // a JPEG's first bytes (ISO/IEC 10918-1 SOI marker): only the size is wrong
    const res = await tech.upload('PUT', uploadPath(home.id, randomUUID(), 'kind=photo&subject=fan&name=huge.jpg'), big, 'image/jpeg');
    expect(res.status).toBe(413);
    expect(res.body.error.fields[0].field).toBe('file');
    expect(await count('attachments')).toBe(before);
  });

  it('rejects a text file sent as image/jpeg and named .jpg, naming the file', async () => {
    const before = await count('attachments');
    const id = randomUUID();
    const text = new TextEncoder().encode('Manometer read 1.2 in. WC; photo to follow.\n');
    const res = await tech.upload('PUT', uploadPath(home.id, id, 'kind=photo&subject=manometer&name=manometer.jpg'), new Uint8Array(text), 'image/jpeg');
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].field).toBe('file');
    expect(await count('attachments')).toBe(before);
    expect(await app.storage.get(`${(await tech.get('/api/auth/session')).body.user.companyId}/${home.id}/${id}`)).toBeNull();
  });

  it('rejects a PNG sent as a lab report (PDF only) with 415 naming the file', async () => {
    const before = await count('attachments');
    const res = await tech.upload('PUT', uploadPath(home.id, randomUUID(), 'kind=lab_report&name=report.png'), await photo('png'), 'image/png');
    expect(res.status).toBe(415);
    expect(res.body.error.fields[0].field).toBe('file');
    expect(await count('attachments')).toBe(before);
  });
});

describe('photos and lab reports', () => {
  let home: { id: string };
  let visitId: string;
  let companyId: string;
  beforeAll(async () => {
    home = await newHome();
    const visit = visitBody();
    visitId = visit.id;
    expect((await tech.post(`/api/homes/${home.id}/visits`, visit)).status).toBe(201);
    companyId = (await tech.get('/api/auth/session')).body.user.companyId;
  });

  it('stores a photo and its thumbnail in object storage, lists it on the visit and streams the same bytes back', async () => {
    const jpeg = await photo('jpeg');
    const id = randomUUID();
    const res = await tech.upload('PUT', uploadPath(home.id, id, `kind=photo&subject=manometer&visitId=${visitId}&name=IMG_0042.jpg`), jpeg, 'image/jpeg');
    expect(res.status).toBe(201);
    expect(res.body.attachment).toEqual({ id, kind: 'photo', subject: 'manometer', contentType: 'image/jpeg', byteSize: jpeg.length });

    // In the bucket under <company>/<home>/<attachment>, with a JPEG thumbnail of at most 320 px beside it (product rule).
    const key = `${companyId}/${home.id}/${id}`;
    const original = await app.storage.get(key);
    expect(Buffer.compare(await readAll(original!.body), Buffer.from(jpeg))).toBe(0);
    const thumb = await readAll((await app.storage.get(`${key}-thumb.jpg`))!.body);
    const meta = await sharp(thumb).metadata();
    expect(meta.format).toBe('jpeg');
    expect(Math.max(meta.width!, meta.height!)).toBe(320); // 640 × 480 scaled to fit 320: 320 × 240
    expect(meta.height).toBe(240);

    const visit = (await tech.get(`/api/homes/${home.id}`)).body.visits.find((v: { id: string }) => v.id === visitId);
    expect(visit.attachments).toEqual([{ id, kind: 'photo', subject: 'manometer', contentType: 'image/jpeg' }]);

    const download = await tech.download(`/api/attachments/${id}`);
    expect(download.status).toBe(200);
    expect(download.headers.get('content-type')).toBe('image/jpeg');
    expect(download.headers.get('cache-control')).toContain('private');
    expect(Buffer.compare(download.bytes, Buffer.from(jpeg))).toBe(0);
    const thumbnail = await tech.download(`/api/attachments/${id}/thumbnail`);
    expect(thumbnail.status).toBe(200);
    expect(thumbnail.headers.get('content-type')).toBe('image/jpeg');
    expect(Buffer.compare(thumbnail.bytes, thumb)).toBe(0);
  });

  it('stores a retried upload once and answers the retry with 200 and the same attachment', async () => {
    const png = await photo('png');
    const id = randomUUID();
    const path = uploadPath(home.id, id, `kind=photo&subject=fan&visitId=${visitId}&name=fan.png`);
    const first = await tech.upload('PUT', path, png, 'image/png');
    const second = await tech.upload('PUT', path, png, 'image/png');
    expect(first.status).toBe(201);
    expect(second.status).toBe(200);
    expect(second.body).toEqual(first.body);
    expect(await count('attachments', 'id = $1', [id])).toBe(1);
    // The same id at another home is someone else's record.
    const elsewhere = await newHome();
    expect((await tech.upload('PUT', uploadPath(elsewhere.id, id, 'kind=photo&name=fan.png'), png, 'image/png')).status).toBe(409);
  });

  it("keeps files from other companies and signed-out visitors: 404 and 401, never the bytes", async () => {
    const id = randomUUID();
    expect((await tech.upload('PUT', uploadPath(home.id, id, 'kind=photo&subject=suction_point'), await photo('jpeg'), 'image/jpeg')).status).toBe(201);
    const theirs = await other.download(`/api/attachments/${id}`);
    expect(theirs.status).toBe(404);
    expect(theirs.bytes.toString()).not.toContain('JFIF');
    expect((await other.download(`/api/attachments/${id}/thumbnail`)).status).toBe(404);
    expect((await new ApiClient(app.url).download(`/api/attachments/${id}`)).status).toBe(401);
    // Nor can they upload to this company's home.
    expect((await other.upload('PUT', uploadPath(home.id, randomUUID(), 'kind=photo'), await photo('jpeg'), 'image/jpeg')).status).toBe(404);
  });

  it('refuses a photo tied to a visit of another home, naming visitId', async () => {
    const elsewhere = await newHome();
    const visit = visitBody();
    expect((await tech.post(`/api/homes/${elsewhere.id}/visits`, visit)).status).toBe(201);
    const before = await count('attachments');
    const res = await tech.upload('PUT', uploadPath(home.id, randomUUID(), `kind=photo&visitId=${visit.id}`), await photo('jpeg'), 'image/jpeg');
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].field).toBe('visitId');
    expect(await count('attachments')).toBe(before);
  });

  it('attaches a lab report PDF to a radon test and serves it inline as a PDF', async () => {
    const test = testBody();
    expect((await tech.post(`/api/homes/${home.id}/radon-tests`, test)).status).toBe(201);
    // The smallest shape of a PDF file: header, then the end-of-file marker (ISO 32000-1 §7.5).
    const pdf = new Uint8Array(new TextEncoder().encode('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n'));
    const id = randomUUID();
    const res = await tech.upload('PUT', uploadPath(home.id, id, `kind=lab_report&radonTestId=${test.id}&name=lab%20report.pdf`), pdf, 'application/pdf');
    expect(res.status).toBe(201);
    expect(res.body.attachment).toMatchObject({ kind: 'lab_report', subject: null, contentType: 'application/pdf' });
    const download = await tech.download(`/api/attachments/${id}`);
    expect(download.headers.get('content-type')).toBe('application/pdf');
    expect(download.headers.get('content-disposition')).toMatch(/^inline; filename="lab report\.pdf"/);
    expect(Buffer.compare(download.bytes, Buffer.from(pdf))).toBe(0);
    expect((await tech.download(`/api/attachments/${id}/thumbnail`)).status).toBe(404); // no thumbnail for a PDF
    const listed = (await tech.get(`/api/homes/${home.id}`)).body.tests.find((t: { id: string }) => t.id === test.id);
    expect(listed.attachments).toEqual([{ id, kind: 'lab_report', subject: null, contentType: 'application/pdf' }]);
  });
});

describe('radon tests', () => {
  it('stores a result in pCi/L as Bq/m³ × 37 and one in Bq/m³ as entered', async () => {
    const home = await newHome();
    const pci = await tech.post(`/api/homes/${home.id}/radon-tests`, testBody({ kind: 'pre', result: 2.5, unit: 'pCi/L' }));
    expect(pci.status).toBe(201);
    // Definition of the curie, 1 Ci = 3.7×10¹⁰ Bq: 2.5 pCi/L = 2.5 × 37 = 92.5 Bq/m³ exactly.
    expect(pci.body.test.resultBqM3).toBe(92.5);
    const { rows } = await app.database.pool.query('select result_bq_m3 from radon_tests where id = $1', [pci.body.test.id]);
    expect(rows[0].result_bq_m3).toBe(92.5);
    const bq = await tech.post(`/api/homes/${home.id}/radon-tests`, testBody({ kind: 'pre', result: 148, unit: 'Bq/m3' }));
    expect(bq.body.test.resultBqM3).toBe(148); // stored in Bq/m³ exactly (ANSI/AARST MAH-2019 §7.1)
  });

  it('stores a post test started under 24 h after the fan and lasting under 48 h, with both warnings', async () => {
    const home = await newHome();
    const fanOn = Date.now() - 5 * 24 * HOUR;
    const visit = visitBody({ visitedOn: new Date(fanOn).toISOString().slice(0, 10), fanActivatedAt: new Date(fanOn).toISOString() });
    expect((await tech.post(`/api/homes/${home.id}/visits`, visit)).status).toBe(201);
    const before = await count('radon_tests');
    const body = testBody({
      startedAt: new Date(fanOn + 12 * HOUR).toISOString(), // 12 h after the fan: ANSI/AARST MAH-2019 §7.3.2 asks for at least 24 h
      endedAt: new Date(fanOn + 12 * HOUR + 36 * HOUR).toISOString(), // 36 h: EPA 402-R-92-003 short-term tests last at least 48 h
      device: 'charcoal',
    });
    const res = await tech.post(`/api/homes/${home.id}/radon-tests`, body);
    expect(res.status).toBe(201); // a warning, never a refusal
    expect(await count('radon_tests')).toBe(before + 1);
    const codes = res.body.test.warnings.map((w: { code: string }) => w.code).sort();
    expect(codes).toEqual(['POST_TEST_TOO_SOON', 'SHORT_TERM_UNDER_48H']);
    expect(res.body.test.warnings.find((w: { code: string }) => w.code === 'POST_TEST_TOO_SOON').source).toContain('MAH-2019');
    // The home detail shows the same warnings.
    const listed = (await tech.get(`/api/homes/${home.id}`)).body.tests.find((t: { id: string }) => t.id === body.id);
    expect(listed.warnings.map((w: { code: string }) => w.code).sort()).toEqual(codes);
  });

  it('gives no warning to a post test started 2 days after the fan and lasting 3 days', async () => {
    const home = await newHome();
    const fanOn = Date.now() - 10 * 24 * HOUR;
    await tech.post(`/api/homes/${home.id}/visits`, visitBody({ visitedOn: new Date(fanOn).toISOString().slice(0, 10), fanActivatedAt: new Date(fanOn).toISOString() }));
    // 48 h after the fan (≥ 24 h, MAH-2019 §7.3.2), 72 h long (≥ 48 h, EPA 402-R-92-003).
    const res = await tech.post(
      `/api/homes/${home.id}/radon-tests`,
      testBody({ startedAt: new Date(fanOn + 48 * HOUR).toISOString(), endedAt: new Date(fanOn + 120 * HOUR).toISOString() }),
    );
    expect(res.status).toBe(201);
    expect(res.body.test.warnings).toEqual([]);
  });

  it('stores a test sent twice once, answering the retry with 200', async () => {
    const home = await newHome();
    const body = testBody();
    expect((await tech.post(`/api/homes/${home.id}/radon-tests`, body)).status).toBe(201);
    const again = await tech.post(`/api/homes/${home.id}/radon-tests`, body);
    expect(again.status).toBe(200);
    expect(await count('radon_tests', 'id = $1', [body.id])).toBe(1);
  });
});
