import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { parseEnv } from '../../server/config/env.js';
import { createDatabase, type Database } from '../../server/db/client.js';
import { createApp } from '../../server/app.js';
import { createObjectStorage, type ObjectStorage } from '../../server/lib/object-storage.js';

export const DEMO_PASSWORD = 'demo-pass-2026';

export interface TestApp {
  url: string;
  database: Database;
  /** The app's object storage client (reads back what uploads stored). */
  storage: ObjectStorage;
  close(): Promise<void>;
}

/**
 * The real app on an ephemeral loopback port, against the test database. `overrides` sets further
 * configuration keys (e.g. SMTP_URL of an in-process SMTP fake).
 */
export async function startTestApp(overrides: Record<string, string> = {}): Promise<TestApp> {
  const env = parseEnv({ DATABASE_URL: process.env.TEST_DATABASE_URL, NODE_ENV: 'test', LOG_LEVEL: 'error', CLIENT_DIST: '/nonexistent', ...overrides });
  const database = createDatabase(env.DATABASE_URL, 4);
  const storage = createObjectStorage(env);
  // With an object store given (e.g. an in-process fake from server/fakes/s3.ts), make its bucket as the server does at start.
  if (overrides.S3_ENDPOINT) await storage.ensureBucket();
  const app = createApp({ env, database, storage });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    database,
    storage,
    close: async () => {
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
      await database.close();
    },
  };
}

/** A browser-like API client: keeps the session cookie and sends the CSRF token on writes. */
export class ApiClient {
  cookie = '';
  csrfToken: string | null = null;
  constructor(readonly baseUrl: string) {}

  async request(method: string, path: string, body?: unknown, opts: { csrf?: boolean; headers?: Record<string, string> } = {}) {
    const headers: Record<string, string> = { Accept: 'application/json', ...opts.headers };
    if (this.cookie) headers.Cookie = this.cookie;
    if (body !== undefined) headers['Content-Type'] = 'application/json';
    if (method !== 'GET' && this.csrfToken && opts.csrf !== false) headers['x-csrf-token'] = this.csrfToken;
    const res = await fetch(this.baseUrl + path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
    const setCookie = res.headers.get('set-cookie');
    if (setCookie) this.cookie = setCookie.split(';')[0];
    const text = await res.text();
    const json = text ? JSON.parse(text) : null;
    return { status: res.status, body: json };
  }

  /** Sends raw bytes (a file upload) with the session cookie and CSRF token; the answer is decoded as JSON. */
  async upload(method: 'PUT' | 'POST', path: string, bytes: Uint8Array<ArrayBuffer>, contentType: string) {
    const headers: Record<string, string> = { Accept: 'application/json', 'Content-Type': contentType };
    if (this.cookie) headers.Cookie = this.cookie;
    if (this.csrfToken) headers['x-csrf-token'] = this.csrfToken;
    const res = await fetch(this.baseUrl + path, { method, headers, body: bytes });
    const text = await res.text();
    return { status: res.status, body: text ? JSON.parse(text) : null };
  }

  /** A GET whose answer is kept as bytes (file downloads). */
  async download(path: string) {
    const res = await fetch(this.baseUrl + path, { headers: this.cookie ? { Cookie: this.cookie } : {} });
    return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
  }

  get = (path: string) => this.request('GET', path);
  post = (path: string, body?: unknown) => this.request('POST', path, body);
  patch = (path: string, body?: unknown) => this.request('PATCH', path, body);
  delete = (path: string) => this.request('DELETE', path);

  async signIn(email: string, password = DEMO_PASSWORD) {
    const res = await this.post('/api/auth/sign-in', { email, password });
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
    this.csrfToken = res.body.csrfToken;
    return res.body.user;
  }
}
