import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { CONTACT_ROLES, ROLES, type Role } from '../../shared/schemas/enums.js';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser, otherCompanyUser } from '../setup/demo.js';

let app: TestApp;
const clients = new Map<Role, ApiClient>();
let admin: ApiClient;
let homeId: string;
let homeRef: number;
let communityId: string;
let builderId: string;
let userId: string;

const square = (x: number) => ({
  type: 'Polygon',
  coordinates: [[[x, 10], [x + 0.001, 10], [x + 0.001, 10.001], [x, 10.001], [x, 10]]],
});

beforeAll(async () => {
  app = await startTestApp();
  for (const role of ROLES) {
    const c = new ApiClient(app.url);
    await c.signIn(demoUser(role));
    clients.set(role, c);
  }
  admin = clients.get('admin')!;
  ({ id: homeId, ref: homeRef } = (await admin.get('/api/homes?limit=1')).body.homes[0]);
  communityId = (await admin.get('/api/communities')).body.communities[0].id;
  builderId = (await admin.get('/api/builders')).body.builders[0].id;
  userId = (await admin.get('/api/users')).body.users.find((u: { role: string }) => u.role === 'sales').id;
});
afterAll(() => app.close());

const ALL: readonly Role[] = ROLES;
const EDITORS: readonly Role[] = ['admin', 'manager', 'estimator'];
const ADMIN: readonly Role[] = ['admin'];
/** Who records field work (visits, radon tests, their files). */
const FIELD: readonly Role[] = ['technician', 'admin', 'manager'];
/** The first bytes of a PNG file (PNG specification §5.2). */
const PNG_SIGNATURE = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
let fieldHomeId: Promise<string> | undefined;
/** A home of its own for the field-record routes, away from every community so no statistic moves. */
const fieldHome = () =>
  (fieldHomeId ??= admin
    .post('/api/homes', { number: '70001', street: 'Authorisation Row', city: 'Testville', state: 'ZZ', zip: '00001', lon: 10.3, lat: 10.3 })
    .then((r) => r.body.home.id as string));
/** An id no company has. */
const NOBODY = '00000000-0000-4000-8000-000000000000';
let seq = 0;
const unique = (prefix: string) => `${prefix} ${Date.now()}-${seq++}`;

interface RouteCase {
  route: string;
  allowed: readonly Role[];
  ok: number;
  /** Sends the request; may prepare its own fixture first with the admin client. */
  send(c: ApiClient): Promise<{ status: number }>;
}

const cases: RouteCase[] = [
  { route: 'GET /api/users', allowed: ADMIN, ok: 200, send: (c) => c.get('/api/users') },
  {
    route: 'POST /api/users',
    allowed: ADMIN,
    ok: 201,
    send: (c) => c.post('/api/users', { email: `${unique('u').replace(/\W/g, '')}@example.test`, name: 'New Person', role: 'sales', password: 'long-enough-pass' }),
  },
  { route: 'PATCH /api/users/:id', allowed: ADMIN, ok: 200, send: (c) => c.patch(`/api/users/${userId}`, { name: 'Sales Person' }) },
  { route: 'GET /api/settings', allowed: ALL, ok: 200, send: (c) => c.get('/api/settings') },
  { route: 'PATCH /api/settings', allowed: ADMIN, ok: 200, send: (c) => c.patch('/api/settings', { quoteConfidence: 0.9 }) },
  { route: 'GET /api/builders', allowed: ALL, ok: 200, send: (c) => c.get('/api/builders') },
  { route: 'GET /api/builders/:id', allowed: ALL, ok: 200, send: (c) => c.get(`/api/builders/${builderId}`) },
  { route: 'POST /api/builders', allowed: EDITORS, ok: 201, send: (c) => c.post('/api/builders', { name: unique('Builder') }) },
  { route: 'PATCH /api/builders/:id', allowed: EDITORS, ok: 200, send: (c) => c.patch(`/api/builders/${builderId}`, { notes: 'checked' }) },
  {
    route: 'DELETE /api/builders/:id',
    allowed: EDITORS,
    ok: 204,
    send: async (c) => c.delete(`/api/builders/${(await admin.post('/api/builders', { name: unique('Doomed') })).body.builder.id}`),
  },
  { route: 'GET /api/communities', allowed: ALL, ok: 200, send: (c) => c.get('/api/communities') },
  { route: 'GET /api/communities/:id', allowed: ALL, ok: 200, send: (c) => c.get(`/api/communities/${communityId}`) },
  { route: 'POST /api/communities', allowed: EDITORS, ok: 201, send: (c) => c.post('/api/communities', { name: unique('Phase'), boundary: square(20 + seq * 0.01) }) },
  { route: 'PATCH /api/communities/:id', allowed: EDITORS, ok: 200, send: (c) => c.patch(`/api/communities/${communityId}`, { jurisdiction: 'County' }) },
  {
    route: 'DELETE /api/communities/:id',
    allowed: EDITORS,
    ok: 204,
    send: async (c) =>
      c.delete(`/api/communities/${(await admin.post('/api/communities', { name: unique('Doomed'), boundary: square(30 + seq * 0.01) })).body.community.id}`),
  },
  { route: 'GET /api/homes', allowed: ALL, ok: 200, send: (c) => c.get('/api/homes') },
  { route: 'GET /api/homes/:id', allowed: ALL, ok: 200, send: (c) => c.get(`/api/homes/${homeId}`) },
  { route: 'GET /api/homes/ref/:ref', allowed: ALL, ok: 200, send: (c) => c.get(`/api/homes/ref/${homeRef}`) },
  {
    route: 'POST /api/homes',
    allowed: EDITORS,
    ok: 201,
    send: (c) => c.post('/api/homes', { number: String(90000 + seq++), street: 'Test Loop', city: 'Testville', state: 'ZZ', zip: '00001', lon: 10, lat: 10 }),
  },
  { route: 'PATCH /api/homes/:id', allowed: EDITORS, ok: 200, send: (c) => c.patch(`/api/homes/${homeId}`, { suctionPointNote: 'utility room' }) },
  {
    route: 'DELETE /api/homes/:id',
    allowed: EDITORS,
    ok: 204,
    send: async (c) =>
      c.delete(
        `/api/homes/${(await admin.post('/api/homes', { number: String(80000 + seq++), street: 'Test Loop', city: 'Testville', state: 'ZZ', zip: '00001', lon: 10, lat: 10 })).body.home.id}`,
      ),
  },
  // Address imports (survey editors). Routes that need a stored batch are walked with an id no company has:
  // an allowed role passes the role gate and gets 404, any other role is stopped at the gate with 403.
  { route: 'GET /api/imports', allowed: EDITORS, ok: 200, send: (c) => c.get('/api/imports') },
  { route: 'POST /api/imports/mapping-suggestions', allowed: EDITORS, ok: 200, send: (c) => c.post('/api/imports/mapping-suggestions', { headers: ['Address', 'City'] }) },
  { route: 'POST /api/imports (no file)', allowed: EDITORS, ok: 400, send: (c) => c.post('/api/imports', {}) },
  { route: 'GET /api/imports/:id', allowed: EDITORS, ok: 404, send: (c) => c.get(`/api/imports/${NOBODY}`) },
  { route: 'GET /api/imports/:id/errors.csv', allowed: EDITORS, ok: 404, send: (c) => c.get(`/api/imports/${NOBODY}/errors.csv`) },
  { route: 'POST /api/imports/:id/undo', allowed: EDITORS, ok: 404, send: (c) => c.post(`/api/imports/${NOBODY}/undo`, {}) },
  // Builder comparison, sampling plans, quotes.
  { route: 'GET /api/insight/builders', allowed: EDITORS, ok: 200, send: (c) => c.get('/api/insight/builders') },
  { route: 'GET /api/sampling/size', allowed: EDITORS, ok: 200, send: (c) => c.get(`/api/sampling/size?communityId=${communityId}&marginOfError=0.1&expectedRate=0.3`) },
  { route: 'GET /api/sampling/plans', allowed: EDITORS, ok: 200, send: (c) => c.get('/api/sampling/plans') },
  { route: 'GET /api/sampling/plans/:id', allowed: EDITORS, ok: 404, send: (c) => c.get(`/api/sampling/plans/${NOBODY}`) },
  { route: 'POST /api/sampling/plans (invalid body)', allowed: EDITORS, ok: 400, send: (c) => c.post('/api/sampling/plans', {}) },
  { route: 'GET /api/quotes', allowed: EDITORS, ok: 200, send: (c) => c.get('/api/quotes') },
  { route: 'GET /api/quotes/:id', allowed: EDITORS, ok: 404, send: (c) => c.get(`/api/quotes/${NOBODY}`) },
  { route: 'GET /api/quotes/:id/pdf', allowed: EDITORS, ok: 404, send: (c) => c.get(`/api/quotes/${NOBODY}/pdf`) },
  { route: 'POST /api/quotes (invalid body)', allowed: EDITORS, ok: 400, send: (c) => c.post('/api/quotes', {}) },
  { route: 'POST /api/quotes/:id/approve', allowed: ['admin', 'manager'], ok: 404, send: (c) => c.post(`/api/quotes/${NOBODY}/approve`, {}) },
  { route: 'POST /api/quotes/:id/send', allowed: EDITORS, ok: 404, send: (c) => c.post(`/api/quotes/${NOBODY}/send`, {}) },
  { route: 'POST /api/quotes/:id/decision', allowed: EDITORS, ok: 404, send: (c) => c.post(`/api/quotes/${NOBODY}/decision`, { decision: 'accepted' }) },
  {
    route: 'POST /api/home-results/:id/email',
    allowed: CONTACT_ROLES,
    ok: 404,
    send: (c) => c.post(`/api/home-results/${NOBODY}/email`, { recipientEmail: 'owner@example.test' }),
  },
  { route: 'GET /api/fans', allowed: ALL, ok: 200, send: (c) => c.get('/api/fans') },
  { route: 'POST /api/fans', allowed: ADMIN, ok: 201, send: (c) => c.post('/api/fans', { name: unique('Fan'), curve: [{ flowCfm: 0, staticInWc: 1.5 }, { flowCfm: 90, staticInWc: 0 }] }) },
  {
    route: 'PUT /api/fans/:id',
    allowed: ADMIN,
    ok: 200,
    send: async (c) => {
      const fan = (await admin.get('/api/fans')).body.fans[0];
      return c.request('PUT', `/api/fans/${fan.id}`, { name: fan.name, curve: fan.curve });
    },
  },
  {
    route: 'POST /api/homes/:homeId/visits',
    allowed: FIELD,
    ok: 201,
    send: async (c) => c.post(`/api/homes/${await fieldHome()}/visits`, { id: randomUUID(), visitedOn: '2026-01-05', status: 'no_access' }),
  },
  {
    route: 'POST /api/homes/:homeId/radon-tests',
    allowed: FIELD,
    ok: 201,
    send: async (c) =>
      c.post(`/api/homes/${await fieldHome()}/radon-tests`, {
        id: randomUUID(),
        kind: 'pre',
        device: 'charcoal',
        startedAt: '2026-01-01T12:00:00Z',
        endedAt: '2026-01-04T12:00:00Z',
        result: 3.1,
        unit: 'pCi/L',
      }),
  },
  // No home has this id: a role that may upload gets as far as the home check (no object storage needed).
  {
    route: 'PUT /api/homes/:homeId/attachments/:attachmentId',
    allowed: FIELD,
    ok: 404,
    send: (c) => c.upload('PUT', `/api/homes/${NOBODY}/attachments/${randomUUID()}?kind=photo`, PNG_SIGNATURE, 'image/png'),
  },
  { route: 'GET /api/attachments/:id', allowed: ALL, ok: 404, send: (c) => c.get(`/api/attachments/${NOBODY}`) },
  { route: 'GET /api/attachments/:id/thumbnail', allowed: ALL, ok: 404, send: (c) => c.get(`/api/attachments/${NOBODY}/thumbnail`) },
];

describe('every API route × every role', () => {
  for (const c of cases) {
    for (const role of ROLES) {
      const expected = c.allowed.includes(role) ? c.ok : 403;
      it(`${c.route} as ${role} → ${expected}`, async () => {
        expect((await c.send(clients.get(role)!)).status).toBe(expected);
      });
    }
    it(`${c.route} signed out → 401`, async () => {
      expect((await c.send(new ApiClient(app.url))).status).toBe(401);
    });
  }

  it('answers 404 in the shared shape for an unknown API route', async () => {
    const res = await admin.get('/api/nothing-here');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('NOT_FOUND');
  });
});

describe('tenant isolation', () => {
  it("gives another company's user 404 for this company's home, builder and community ids", async () => {
    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    expect((await other.get(`/api/homes/${homeId}`)).status).toBe(404);
    expect((await other.get(`/api/homes/ref/${homeRef}`)).status).toBe(404);
    expect((await other.patch(`/api/homes/${homeId}`, { suctionPointNote: 'x' })).status).toBe(404);
    expect((await other.delete(`/api/homes/${homeId}`)).status).toBe(404);
    expect((await other.get(`/api/builders/${builderId}`)).status).toBe(404);
    expect((await other.get(`/api/communities/${communityId}`)).status).toBe(404);
    expect((await other.patch(`/api/users/${userId}`, { name: 'x' })).status).toBe(404);
    // The home is untouched for its own company.
    expect((await admin.get(`/api/homes/${homeId}`)).status).toBe(200);
  });

  it("never lists another company's rows", async () => {
    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    const mine = (await admin.get('/api/homes?limit=500')).body.homes.map((h: { id: string }) => h.id);
    const theirs = (await other.get('/api/homes?limit=500')).body.homes.map((h: { id: string }) => h.id);
    expect(theirs.length).toBeGreaterThan(0);
    expect(theirs.filter((id: string) => mine.includes(id))).toEqual([]);
    const theirBuilders = (await other.get('/api/builders')).body.builders.map((b: { id: string }) => b.id);
    expect(theirBuilders).not.toContain(builderId);
  });

  it('refuses to attach another company’s builder to a home', async () => {
    const other = new ApiClient(app.url);
    await other.signIn(otherCompanyUser('admin'));
    const theirHome = (await other.get('/api/homes?limit=1')).body.homes[0].id;
    const res = await other.patch(`/api/homes/${theirHome}`, { builderId });
    expect(res.status).toBe(422);
    expect(res.body.error.fields[0].field).toBe('builderId');
  });

  it('hides owner contact details from technicians but shows them to sales', async () => {
    const tech = (await clients.get('technician')!.get(`/api/homes/${homeId}`)).body.home;
    const sales = (await clients.get('sales')!.get(`/api/homes/${homeId}`)).body.home;
    expect(tech.contact).toBeNull();
    expect(sales.contact).toHaveProperty('ownerName');
  });
});
