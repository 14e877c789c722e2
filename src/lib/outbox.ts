// Records made in the field wait here (IndexedDB, so they survive a reload or a flat battery) until the
// server has them. Each item carries the record's own client-generated id, so sending it twice — a retry
// after a lost answer — stores it once. Items go out in the order they were saved, and an item that
// belongs to another (a photo to its visit) only after that one was accepted.
import { useSyncExternalStore } from 'react';
import { createStore, del, entries, get, set, type UseStore } from 'idb-keyval';
import { ApiErrorBody } from '@shared/schemas/common';
import type { SessionResponse } from '@shared/schemas/auth';
import { setCsrfToken } from './api-client';

export interface OutboxRequest {
  method: 'POST' | 'PUT';
  /** Same-origin path with its query string. */
  url: string;
  /** A JSON body… */
  json?: unknown;
  /** …or raw bytes (photos and lab reports are kept as Blobs) with their content type. */
  blob?: Blob;
  contentType?: string;
}

export interface OutboxFailure {
  status: number;
  code: string;
  message: string;
  fields: { field: string; message: string }[];
  at: string;
}

export interface OutboxItem {
  /** The record's client-generated id; also the queue key. */
  id: string;
  /** Send order. */
  seq: number;
  /** What the record is, for people: 'visit', 'photo', 'radon_test', 'lab_report'. */
  kind: string;
  /** Shown in the list of records that could not be sent. */
  label: string;
  homeId: string;
  /** Who saved it: only that user's session sends it. */
  userId: string;
  request: OutboxRequest;
  /** Id of the item that must be accepted first. */
  after?: string;
  queuedAt: string;
  attempts: number;
  /** Set when the server refused the record (4xx): it stays listed until the user removes it. */
  failure?: OutboxFailure;
}

export type NewOutboxItem = Pick<OutboxItem, 'id' | 'kind' | 'label' | 'homeId' | 'request' | 'after'>;

export interface OutboxState {
  loaded: boolean;
  /** The signed-in user's records still to send, in order. */
  pending: OutboxItem[];
  /** The signed-in user's records the server refused. */
  failed: OutboxItem[];
  sending: boolean;
  /** The server answered 401: records wait until the user signs in again. */
  needsSignIn: boolean;
  /** When the queue was last emptied by sending (ms since epoch), for a brief "All sent". */
  lastFlushedAt: number | null;
  /** Why the last attempt stopped (network, server error), for the indicator's title. */
  lastProblem: string | null;
}

const RETRY_MIN_MS = 5_000;
const RETRY_MAX_MS = 5 * 60_000;
/** Even without an 'online' event, look again this often while records wait. */
const IDLE_CHECK_MS = 30_000;
/** A 15 MiB photo on one bar of signal can take a while; past this the attempt counts as a network failure. */
const REQUEST_TIMEOUT_MS = 120_000;

let store: UseStore | null = null;
const db = () => (store ??= createStore('tractwise-outbox', 'items'));

let items = new Map<string, OutboxItem>();
let userId: string | null = null;
let state: OutboxState = { loaded: false, pending: [], failed: [], sending: false, needsSignIn: false, lastFlushedAt: null, lastProblem: null };
const listeners = new Set<() => void>();
const sentListeners = new Set<(sent: OutboxItem[]) => void>();
let loading: Promise<void> | null = null;
let running: Promise<void> | null = null;
let timer: ReturnType<typeof setTimeout> | null = null;
let retryMs = RETRY_MIN_MS;
let starts = 0;

function publish(patch: Partial<OutboxState> = {}) {
  const mine = [...items.values()].filter((i) => i.userId === userId).sort((a, b) => a.seq - b.seq);
  state = { ...state, ...patch, pending: mine.filter((i) => !i.failure), failed: mine.filter((i) => i.failure) };
  for (const listener of listeners) listener();
}

function load(): Promise<void> {
  loading ??= entries<string, OutboxItem>(db()).then((rows) => {
    items = new Map(rows.map(([, item]) => [item.id, item]));
    publish({ loaded: true });
  });
  return loading;
}

function schedule(ms: number) {
  if (timer) clearTimeout(timer);
  timer = setTimeout(() => {
    timer = null;
    void flushOutbox();
  }, ms);
}

class RetryLater extends Error {}
class SignedOut extends Error {}

/** A fresh synchroniser token for the replay: the one in memory may belong to a session that has since ended. */
async function freshSession(): Promise<SessionResponse> {
  const res = await fetch('/api/auth/session', { headers: { Accept: 'application/json' }, credentials: 'same-origin', cache: 'no-store' });
  if (!res.ok) throw new RetryLater(`The server answered ${res.status}`);
  const session = (await res.json()) as SessionResponse;
  setCsrfToken(session.csrfToken);
  if (!session.user) throw new SignedOut();
  return session;
}

async function send(item: OutboxItem, csrfToken: string | null): Promise<Response> {
  const { request } = item;
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (csrfToken) headers['x-csrf-token'] = csrfToken;
  let body: BodyInit;
  if (request.blob) {
    headers['Content-Type'] = request.contentType || request.blob.type || 'application/octet-stream';
    body = request.blob;
  } else {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(request.json ?? {});
  }
  return fetch(request.url, { method: request.method, headers, body, credentials: 'same-origin', signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS) });
}

async function failure(res: Response): Promise<OutboxFailure> {
  const data: unknown = await res.json().catch(() => null);
  const parsed = ApiErrorBody.safeParse(data);
  const at = new Date().toISOString();
  if (parsed.success) return { status: res.status, at, code: parsed.data.error.code, message: parsed.data.error.message, fields: parsed.data.error.fields ?? [] };
  return { status: res.status, at, code: `HTTP_${res.status}`, message: `The server answered ${res.status}`, fields: [] };
}

/** Worth another try later: no answer, a server-side fault, a timeout or rate limit. Other 4xx will not change. */
const retryable = (status: number) => status >= 500 || status === 408 || status === 429;

async function runFlush() {
  await load();
  if (!userId) return;
  if (typeof navigator !== 'undefined' && navigator.onLine === false) {
    publish({ lastProblem: 'No connection' });
    if (state.pending.length) schedule(IDLE_CHECK_MS);
    return;
  }
  if (state.pending.length === 0) return;
  publish({ sending: true });
  const sent: OutboxItem[] = [];
  try {
    let session = await freshSession();
    if (session.user!.id !== userId) throw new SignedOut();
    for (const item of state.pending) {
      const parent = item.after ? items.get(item.after) : undefined;
      if (parent?.failure) {
        await markFailed(item, { status: 0, code: 'PARENT_REFUSED', message: `Not sent: the ${parent.kind.replace('_', ' ')} it belongs to was refused.`, fields: [], at: new Date().toISOString() });
        continue;
      }
      if (parent) continue; // its parent is still waiting (a re-queued item); keep the order
      let res = await send(item, session.csrfToken);
      if (res.status === 403) {
        const refused = await failure(res.clone());
        if (refused.code === 'CSRF_INVALID') {
          session = await freshSession();
          res = await send(item, session.csrfToken);
        }
      }
      if (res.ok) {
        await del(item.id, db());
        items.delete(item.id);
        sent.push(item);
        publish();
        continue;
      }
      if (res.status === 401) throw new SignedOut();
      if (retryable(res.status)) throw new RetryLater(`The server answered ${res.status}`);
      await markFailed(item, await failure(res));
    }
    retryMs = RETRY_MIN_MS;
    publish({ sending: false, needsSignIn: false, lastProblem: null, lastFlushedAt: sent.length > 0 && state.pending.length === 0 ? Date.now() : state.lastFlushedAt });
  } catch (err) {
    if (err instanceof SignedOut) {
      publish({ sending: false, needsSignIn: true, lastProblem: 'Signed out' });
    } else {
      // Network failure (fetch throws), timeout or 5xx: keep everything and try again later, backing off.
      publish({ sending: false, lastProblem: err instanceof RetryLater ? err.message : 'No connection to the server' });
      schedule(retryMs);
      retryMs = Math.min(retryMs * 2, RETRY_MAX_MS);
    }
  } finally {
    if (sent.length) for (const listener of sentListeners) listener(sent);
  }
}

async function markFailed(item: OutboxItem, fail: OutboxFailure) {
  const next = { ...item, attempts: item.attempts + 1, failure: fail };
  await set(item.id, next, db());
  items.set(item.id, next);
  publish();
}

let again = false;

/**
 * Sends whatever waits, now (nothing happens offline or before `startOutbox`). A call during a running
 * send makes one more run afterwards, so records saved meanwhile do not wait for the next timer.
 */
export function flushOutbox(): Promise<void> {
  if (running) {
    again = true;
    return running;
  }
  running = runFlush().finally(() => {
    running = null;
    if (again) {
      again = false;
      void flushOutbox();
    }
  });
  return running;
}

/**
 * Keeps records on the device until sent. Items are sent in the order given, each after the one
 * named in its `after`. Saving the same id again replaces the waiting copy and keeps its place.
 */
export async function enqueue(newItems: NewOutboxItem[]): Promise<void> {
  if (!userId) throw new Error('Sign in to save records');
  await load();
  let seq = Math.max(Date.now(), ...[...items.values()].map((i) => i.seq + 1));
  for (const n of newItems) {
    const existing = items.get(n.id) ?? (await get<OutboxItem>(n.id, db()));
    const item: OutboxItem = { ...n, userId, seq: existing?.seq ?? seq++, queuedAt: existing?.queuedAt ?? new Date().toISOString(), attempts: 0 };
    await set(item.id, item, db());
    items.set(item.id, item);
  }
  publish();
  void flushOutbox();
}

/** The record and the refused records that belong to it (photos of a refused visit). */
function withChildren(id: string): OutboxItem[] {
  const item = items.get(id);
  if (!item) return [];
  return [item, ...[...items.values()].filter((i) => i.after === id && i.failure?.code === 'PARENT_REFUSED')];
}

/** Forgets a refused record and what belongs to it (the user read the reason and will enter it again). */
export async function removeFromOutbox(id: string) {
  for (const item of withChildren(id)) {
    await del(item.id, db());
    items.delete(item.id);
  }
  publish();
}

/** Puts a refused record (and what belongs to it) back in the queue, e.g. after the company's settings changed. */
export async function retryInOutbox(id: string) {
  for (const item of withChildren(id)) {
    const { failure: _dropped, ...rest } = item;
    await set(rest.id, rest, db());
    items.set(rest.id, rest);
  }
  publish();
  void flushOutbox();
}

/** Called with the records that reached the server (once per send run). */
export function onOutboxSent(listener: (sent: OutboxItem[]) => void) {
  sentListeners.add(listener);
  return () => sentListeners.delete(listener);
}

const wake = () => {
  retryMs = RETRY_MIN_MS;
  void flushOutbox();
};
const wakeIfVisible = () => {
  if (document.visibilityState === 'visible') wake();
};

/**
 * Starts sending for the signed-in user: now, whenever the browser reports a connection again, when
 * the app comes back to the foreground, and on a backing-off timer after failures. Returns `stop`.
 */
export function startOutbox(forUserId: string): () => void {
  userId = forUserId;
  starts += 1;
  if (starts === 1) {
    window.addEventListener('online', wake);
    document.addEventListener('visibilitychange', wakeIfVisible);
  }
  void load().then(() => {
    publish({ needsSignIn: false });
    void flushOutbox();
  });
  return () => {
    starts -= 1;
    if (starts > 0) return;
    userId = null;
    window.removeEventListener('online', wake);
    document.removeEventListener('visibilitychange', wakeIfVisible);
    if (timer) clearTimeout(timer);
    timer = null;
  };
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** The queue as React sees it. */
export function useOutbox(): OutboxState {
  return useSyncExternalStore(subscribe, () => state);
}
