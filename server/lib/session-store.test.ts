import { describe, expect, it } from 'vitest';
import session from 'express-session';
import { readUserWithSession, throttleTouch, userReadWithSession } from './session-store.js';

/** A memory store that counts the expiry writes it is asked for. */
function countingStore() {
  const store = new session.MemoryStore();
  const writes: string[] = [];
  store.touch = (sid, _session, callback) => {
    writes.push(sid);
    callback?.();
  };
  return { store, writes };
}

const cookie = { originalMaxAge: 60_000, maxAge: 60_000, expires: new Date() } as session.Cookie;
const touchOnce = (store: session.Store, sid: string) => new Promise<void>((resolve) => store.touch!(sid, { cookie } as session.SessionData, () => resolve()));

describe('throttleTouch', () => {
  it('writes a session expiry once per interval, and again once the interval has passed', async () => {
    let clock = 1_000_000;
    const { store, writes } = countingStore();
    throttleTouch(store, 60_000, () => clock);
    await touchOnce(store, 'a');
    clock += 59_999;
    await touchOnce(store, 'a');
    expect(writes).toEqual(['a']);
    clock += 1;
    await touchOnce(store, 'a');
    expect(writes).toEqual(['a', 'a']);
  });

  it('keeps sessions apart', async () => {
    const { store, writes } = countingStore();
    throttleTouch(store, 60_000, () => 5);
    await touchOnce(store, 'a');
    await touchOnce(store, 'b');
    await touchOnce(store, 'a');
    expect(writes).toEqual(['a', 'b']);
  });

  it('tries again on the next request when a write failed', async () => {
    const store = new session.MemoryStore();
    let calls = 0;
    store.touch = ((_sid: string, _session: unknown, callback?: (err?: unknown) => void) => {
      calls++;
      callback?.(calls === 1 ? new Error('connection lost') : undefined);
    }) as NonNullable<session.Store['touch']>;
    throttleTouch(store, 60_000, () => 5);
    const errors: unknown[] = [];
    const touch = store.touch as unknown as (sid: string, s: session.SessionData, cb: (err?: unknown) => void) => void;
    for (let i = 0; i < 3; i++) await new Promise<void>((resolve) => touch('a', { cookie } as session.SessionData, (err) => (errors.push(err), resolve())));
    expect(calls).toBe(2);
    expect(errors[0]).toBeInstanceOf(Error);
  });
});

describe('readUserWithSession', () => {
  type User = { id: string; role: string };
  const stored = { cookie: { originalMaxAge: 60_000, expires: new Date(Date.now() + 60_000).toISOString() }, passport: { user: 'u1' } };
  function storeReading(found: { sess: unknown; user: User | null } | undefined) {
    const reads: string[] = [];
    const store = readUserWithSession(new session.MemoryStore(), async (sid) => {
      reads.push(sid);
      return found;
    });
    return { store, reads };
  }
  /** What express-session does with a stored session: get it, then build the request's session from it. */
  const load = (store: session.Store, req: object) =>
    new Promise<session.SessionData | null | undefined>((resolve, reject) =>
      store.get('s1', (err, sess) => {
        if (err) return reject(err);
        if (sess) store.createSession(req as never, sess);
        resolve(sess);
      }),
    );

  it('hands the user read with the session to that request, once', async () => {
    const { store, reads } = storeReading({ sess: structuredClone(stored), user: { id: 'u1', role: 'sales' } });
    const req = { sessionID: 's1', sessionStore: store };
    await load(store, req);
    expect(reads).toEqual(['s1']);
    expect(userReadWithSession<User>(req, 'u1')).toEqual({ id: 'u1', role: 'sales' });
    expect(userReadWithSession<User>(req, 'u1')).toBeUndefined(); // taken: a second ask loads it
  });

  it('never saves the user into the session', async () => {
    const { store } = storeReading({ sess: structuredClone(stored), user: { id: 'u1', role: 'sales' } });
    const sess = await load(store, { sessionID: 's1', sessionStore: store });
    expect(JSON.stringify(sess)).not.toContain('sales');
  });

  it('says null for a user who is gone or deactivated, and undefined for another id', async () => {
    const gone = storeReading({ sess: structuredClone(stored), user: null });
    const req = { sessionID: 's1', sessionStore: gone.store };
    await load(gone.store, req);
    expect(userReadWithSession<User>(req, 'u1')).toBeNull();
    const other = storeReading({ sess: structuredClone(stored), user: { id: 'u2', role: 'admin' } });
    const req2 = { sessionID: 's1', sessionStore: other.store };
    await load(other.store, req2);
    expect(userReadWithSession<User>(req2, 'u1')).toBeUndefined();
  });

  it('answers no session when none is stored, and leaves the request without a user', async () => {
    const { store } = storeReading(undefined);
    const req = { sessionID: 's1', sessionStore: store };
    expect(await load(store, req)).toBeNull();
    expect(userReadWithSession<User>(req, 'u1')).toBeUndefined();
  });

  it('answers no session, and does not hang, for a stored value that is not an object', async () => {
    for (const sess of [null, 42, 'null', '"text"']) {
      const { store } = storeReading({ sess, user: { id: 'u1', role: 'sales' } });
      const req = { sessionID: 's1', sessionStore: store };
      expect(await load(store, req)).toBeFalsy();
      expect(userReadWithSession<User>(req, 'u1')).toBeUndefined();
    }
  });
});
