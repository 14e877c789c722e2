import { describe, expect, it } from 'vitest';
import session from 'express-session';
import { throttleTouch } from './session-store.js';

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
