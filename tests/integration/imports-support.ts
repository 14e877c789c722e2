// Helpers for the import tests and benchmark: upload a CSV the way the import page does, and wait for the job.
import { randomUUID } from 'node:crypto';
import type { ApiClient } from '../setup/test-app.js';

export interface UploadOptions {
  id?: string;
  fileName?: string;
  mapping?: Record<string, string>;
  createBuilders?: boolean;
  createCommunities?: boolean;
  contentType?: string;
}

/** POST /api/imports with the file as the body (`text/csv`), as the browser sends it. */
export async function uploadCsv(client: ApiClient, body: string | Buffer, opts: UploadOptions = {}) {
  const id = opts.id ?? randomUUID();
  const query = new URLSearchParams({ id, fileName: opts.fileName ?? 'addresses.csv' });
  if (opts.mapping) query.set('mapping', JSON.stringify(opts.mapping));
  if (opts.createBuilders) query.set('createBuilders', 'true');
  if (opts.createCommunities) query.set('createCommunities', 'true');
  const headers: Record<string, string> = { 'Content-Type': opts.contentType ?? 'text/csv', Accept: 'application/json' };
  if (client.cookie) headers.Cookie = client.cookie;
  if (client.csrfToken) headers['x-csrf-token'] = client.csrfToken;
  const res = await fetch(`${client.baseUrl}/api/imports?${query}`, { method: 'POST', headers, body: typeof body === 'string' ? body : new Uint8Array(body) });
  const text = await res.text();
  return { id, status: res.status, body: text ? JSON.parse(text) : null };
}

/** Polls the import until it is committed or failed. */
export async function waitForImport(client: ApiClient, id: string, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await client.get(`/api/imports/${id}`);
    if (res.status !== 200) throw new Error(`GET /api/imports/${id} → ${res.status} ${JSON.stringify(res.body)}`);
    const job = res.body.import;
    if (job.status === 'committed' || job.status === 'failed' || job.status === 'undone') return job;
    if (Date.now() > deadline) throw new Error(`import ${id} still ${job.status} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** Upload and wait: the job as it ended. */
export async function importCsv(client: ApiClient, body: string | Buffer, opts: UploadOptions = {}) {
  const started = await uploadCsv(client, body, opts);
  if (started.status !== 202 && started.status !== 200) return { started, job: null };
  return { started, job: await waitForImport(client, started.id) };
}
