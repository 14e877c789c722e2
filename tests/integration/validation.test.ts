import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser } from '../setup/demo.js';

let app: TestApp;
let admin: ApiClient;
let ids: { home: string; community: string; builder: string; user: string };

beforeAll(async () => {
  app = await startTestApp();
  admin = new ApiClient(app.url);
  await admin.signIn(demoUser('admin'));
  ids = {
    home: (await admin.get('/api/homes?limit=1')).body.homes[0].id,
    community: (await admin.get('/api/communities')).body.communities.find((c: { yearTo: number | null }) => c.yearTo !== null).id,
    builder: (await admin.get('/api/builders')).body.builders[0].id,
    user: (await admin.get('/api/users')).body.users.find((u: { role: string }) => u.role === 'sales').id,
  };
});
afterAll(() => app.close());

/** A fingerprint of every table a write route touches, to prove a rejected write changed nothing. */
async function snapshot() {
  const { rows } = await app.database.pool.query(`
    select (select md5(string_agg(t::text, ',' order by id)) from users t) as users,
           (select md5(string_agg(t::text, ',' order by id)) from builders t) as builders,
           (select md5(string_agg(t::text, ',' order by id)) from communities t) as communities,
           (select md5(string_agg(t::text, ',' order by community_id, builder_id)) from community_builders t) as cb,
           (select md5(string_agg(t::text, ',' order by id)) from homes t) as homes,
           (select md5(string_agg(t::text, ',' order by id)) from companies t) as companies`);
  return rows[0];
}

const bowtie = { type: 'Polygon', coordinates: [[[0, 0], [1, 1], [1, 0], [0, 1], [0, 0]]] };
const openRing = { type: 'Polygon', coordinates: [[[0, 0], [1, 0], [1, 1], [0, 1]]] };

const cases: { name: string; method: string; path: () => string; body: unknown; status: number; field: string }[] = [
  { name: 'a user with a malformed e-mail', method: 'POST', path: () => '/api/users', body: { email: 'nope', name: 'X', role: 'sales', password: 'long-enough-pass' }, status: 400, field: 'email' },
  { name: 'a user with an unknown role', method: 'POST', path: () => '/api/users', body: { email: 'a@b.test', name: 'X', role: 'king', password: 'long-enough-pass' }, status: 400, field: 'role' },
  { name: 'a user with a short password', method: 'POST', path: () => '/api/users', body: { email: 'a@b.test', name: 'X', role: 'sales', password: 'short' }, status: 400, field: 'password' },
  { name: 'a role change to an unknown role', method: 'PATCH', path: () => `/api/users/${ids.user}`, body: { role: 'king' }, status: 400, field: 'role' },
  { name: 'a negative action level', method: 'PATCH', path: () => '/api/settings', body: { actionLevelBqM3: -1 }, status: 400, field: 'actionLevelBqM3' },
  { name: 'a "consider" level above the action level', method: 'PATCH', path: () => '/api/settings', body: { considerLevelBqM3: 500 }, status: 422, field: 'considerLevelBqM3' },
  { name: 'a builder without a name', method: 'POST', path: () => '/api/builders', body: { name: '' }, status: 400, field: 'name' },
  { name: 'a builder renamed to a number', method: 'PATCH', path: () => `/api/builders/${ids.builder}`, body: { name: 5 }, status: 400, field: 'name' },
  { name: 'a community with an open ring', method: 'POST', path: () => '/api/communities', body: { name: 'Open', boundary: openRing }, status: 400, field: 'boundary.coordinates.0' },
  { name: 'a community with a self-crossing boundary', method: 'POST', path: () => '/api/communities', body: { name: 'Bowtie', boundary: bowtie }, status: 422, field: 'boundary' },
  { name: 'a community built 2015–2009', method: 'POST', path: () => '/api/communities', body: { name: 'Backwards', boundary: { type: 'Polygon', coordinates: [[[5, 5], [5.01, 5], [5.01, 5.01], [5, 5]]] }, yearFrom: 2015, yearTo: 2009 }, status: 400, field: 'yearTo' },
  { name: 'a community year patched out of order', method: 'PATCH', path: () => `/api/communities/${ids.community}`, body: { yearFrom: 2099 }, status: 422, field: 'yearTo' },
  { name: 'a community with an unknown builder', method: 'PATCH', path: () => `/api/communities/${ids.community}`, body: { builderIds: ['00000000-0000-4000-8000-000000000000'] }, status: 422, field: 'builderIds' },
  { name: 'a home with a bad ZIP', method: 'POST', path: () => '/api/homes', body: { number: '1', street: 'A St', city: 'B', state: 'ZZ', zip: 'ABCDE', lon: 1, lat: 1 }, status: 400, field: 'zip' },
  { name: 'a home off the globe', method: 'POST', path: () => '/api/homes', body: { number: '1', street: 'A St', city: 'B', state: 'ZZ', zip: '00001', lon: 1, lat: 95 }, status: 400, field: 'lat' },
  { name: 'a home built in 1500', method: 'PATCH', path: () => `/api/homes/${ids.home}`, body: { yearBuilt: 1500 }, status: 400, field: 'yearBuilt' },
  { name: 'a home with a 5-inch pipe', method: 'PATCH', path: () => `/api/homes/${ids.home}`, body: { pipeSizeIn: 5 }, status: 400, field: 'pipeSizeIn' },
  { name: 'a home moved with only a longitude', method: 'PATCH', path: () => `/api/homes/${ids.home}`, body: { lon: 1 }, status: 422, field: 'lat' },
  { name: 'a home with an unknown builder', method: 'PATCH', path: () => `/api/homes/${ids.home}`, body: { builderId: '00000000-0000-4000-8000-000000000000' }, status: 422, field: 'builderId' },
  { name: 'a delete with a malformed id', method: 'DELETE', path: () => '/api/homes/not-a-uuid', body: undefined, status: 400, field: 'id' },
];

describe('bad input on write routes', () => {
  for (const c of cases) {
    it(`rejects ${c.name} with ${c.status}, names ${c.field}, and writes nothing`, async () => {
      const before = await snapshot();
      const res = await admin.request(c.method, c.path(), c.body);
      expect(res.status).toBe(c.status);
      expect(res.body.error.fields.map((f: { field: string }) => f.field)).toContain(c.field);
      expect(await snapshot()).toEqual(before);
    });
  }

  it('rejects a body that is not JSON with 400', async () => {
    const res = await fetch(app.url + '/api/builders', {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Cookie: admin.cookie, 'x-csrf-token': admin.csrfToken! },
      body: '{"name": ',
    });
    expect(res.status).toBe(400);
  });

  it('answers 409 for a second builder with the same name, and keeps one', async () => {
    const name = (await admin.get(`/api/builders/${ids.builder}`)).body.builder.name;
    const res = await admin.post('/api/builders', { name: name.toUpperCase() });
    expect(res.status).toBe(409);
    const { rows } = await app.database.pool.query('select count(*)::int as n from builders where lower(name) = lower($1)', [name]);
    expect(rows[0].n).toBe(1);
  });

  it('keeps the database constraint as a second line of defence', async () => {
    const error = await app.database.db.execute(sql`update visits set vacuum_pa = -1 where id = (select id from visits limit 1)`).catch((e) => e);
    expect(error.cause?.constraint).toBe('visits_vacuum_non_negative');
  });
});
