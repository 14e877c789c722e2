import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, startTestApp, type TestApp } from '../setup/test-app.js';
import { demoUser } from '../setup/demo.js';

let app: TestApp;
beforeAll(async () => {
  app = await startTestApp();
});
afterAll(() => app.close());

describe('sign-in and sessions', () => {
  it('reports database reachability on /api/health', async () => {
    const res = await new ApiClient(app.url).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'ok', database: 'reachable' });
  });

  it('signs the demo technician in and out', async () => {
    const client = new ApiClient(app.url);
    expect((await client.get('/api/auth/session')).body).toEqual({ user: null, csrfToken: null });
    const user = await client.signIn(demoUser('technician'));
    expect(user.role).toBe('technician');
    const session = await client.get('/api/auth/session');
    expect(session.body.user.email).toBe(demoUser('technician'));
    expect(session.body.csrfToken).toBeTruthy();
    expect((await client.post('/api/auth/sign-out')).status).toBe(204);
    expect((await client.get('/api/auth/session')).body.user).toBeNull();
    expect((await client.get('/api/homes')).status).toBe(401);
  });

  it('rejects a wrong password with 401 and the shared error shape', async () => {
    const res = await new ApiClient(app.url).post('/api/auth/sign-in', { email: demoUser('admin'), password: 'not-the-password' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('UNAUTHENTICATED');
  });

  it('sets an httpOnly, SameSite=Lax session cookie and issues a new session id at each sign-in', async () => {
    const res = await fetch(app.url + '/api/auth/sign-in', {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ email: demoUser('manager'), password: 'demo-pass-2026' }),
    });
    const cookie = res.headers.get('set-cookie')!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).toMatch(/Expires=/i); // idle timeout
    const client = new ApiClient(app.url);
    client.cookie = cookie.split(';')[0];
    await client.signIn(demoUser('manager'));
    expect(client.cookie).not.toBe(cookie.split(';')[0]); // session fixation defence
  });

  it('marks the cookie Secure when the request came over HTTPS through a trusted proxy', async () => {
    // COOKIE_SECURE=auto: Secure whenever req.secure; the test app does not trust proxies, so it is not set here.
    const res = await fetch(app.url + '/api/auth/sign-in', {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ email: demoUser('manager'), password: 'demo-pass-2026' }),
    });
    expect(res.headers.get('set-cookie')).not.toMatch(/Secure/i);
  });
});

describe('cross-site request forgery', () => {
  it('refuses a signed-in write without the CSRF token', async () => {
    const client = new ApiClient(app.url);
    await client.signIn(demoUser('admin'));
    const res = await client.request('POST', '/api/builders', { name: 'No Token Homes' }, { csrf: false });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('CSRF_INVALID');
    const list = await client.get('/api/builders');
    expect(list.body.builders.map((b: { name: string }) => b.name)).not.toContain('No Token Homes');
  });

  it('refuses a write whose Origin is another site, even with the token', async () => {
    const client = new ApiClient(app.url);
    await client.signIn(demoUser('admin'));
    const res = await client.request('POST', '/api/builders', { name: 'Foreign Origin Homes' }, { headers: { Origin: 'http://evil.example' } });
    expect(res.status).toBe(403);
  });

  it('accepts the write with the token from the session', async () => {
    const client = new ApiClient(app.url);
    await client.signIn(demoUser('admin'));
    const res = await client.post('/api/builders', { name: 'Token Holder Homes', notes: '' });
    expect(res.status).toBe(201);
    expect((await client.delete(`/api/builders/${res.body.builder.id}`)).status).toBe(204);
  });

  it("applies a user's new role and deactivation on the very next request of a session already open", async () => {
    const admin = new ApiClient(app.url);
    await admin.signIn(demoUser('admin'));
    const email = `role-change-${Date.now()}@example.test`;
    const created = await admin.post('/api/users', { email, name: 'Role Change', role: 'sales', password: 'long-enough-pass' });
    expect(created.status).toBe(201);
    const person = new ApiClient(app.url);
    await person.signIn(email, 'long-enough-pass');
    expect((await person.get('/api/auth/session')).body.user.role).toBe('sales');
    expect((await person.get('/api/users')).status).toBe(403);

    expect((await admin.patch(`/api/users/${created.body.user.id}`, { role: 'admin' })).status).toBe(200);
    expect((await person.get('/api/auth/session')).body.user.role).toBe('admin');
    expect((await person.get('/api/users')).status).toBe(200);

    expect((await admin.patch(`/api/users/${created.body.user.id}`, { active: false })).status).toBe(200);
    expect((await person.get('/api/auth/session')).body.user).toBeNull();
    expect((await person.get('/api/homes')).status).toBe(401);
    expect((await person.get('/tiles/homes/14/0/0.pbf')).status).toBe(401);
  });

  it('reads a signed-in request\'s session and user in one query', async () => {
    const client = new ApiClient(app.url);
    await client.signIn(demoUser('estimator'));
    await client.get('/api/auth/session'); // the session's expiry is written now, then at most once a minute
    const pool = app.database.pool;
    const sent: string[] = [];
    const query = pool.query.bind(pool);
    pool.query = ((...args: Parameters<typeof query>) => {
      const text = args[0] as unknown;
      sent.push(typeof text === 'string' ? text : (text as { text: string }).text);
      return query(...args);
    }) as typeof pool.query;
    try {
      const res = await client.get('/api/auth/session');
      expect(res.body.user.email).toBe(demoUser('estimator'));
    } finally {
      pool.query = query;
    }
    expect(sent).toHaveLength(1);
    expect(sent[0]).toMatch(/from "session" left join "users"/);
  });
});
