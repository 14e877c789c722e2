import type { Store } from 'express-session';
import { LRUCache } from 'lru-cache';

/** express-session passes an error to the touch callback, which its type definitions leave out. */
type Touch = (sid: string, session: Parameters<NonNullable<Store['touch']>>[1], callback?: (err?: unknown) => void) => void;

/**
 * Lazy session expiry writes (the `touchAfter` idea of connect-mongo): with rolling sessions,
 * express-session asks the store to push a session's expiry on every request, and holds back the
 * last byte of the response until that UPDATE has committed. A map asks for dozens of tiles at once,
 * so the store writes a session's expiry at most once per `touchAfterMs` and answers the other
 * touches at once. A session can therefore end up to `touchAfterMs` before its full idle time.
 */
export function throttleTouch<S extends Store>(store: S, touchAfterMs: number, now: () => number = Date.now): S {
  const touch = store.touch?.bind(store) as Touch | undefined;
  if (!touch) return store;
  const lastWritten = new LRUCache<string, number>({ max: 50_000 });
  const throttled: Touch = (sid, session, callback) => {
    const at = now();
    const last = lastWritten.get(sid);
    if (last !== undefined && at - last < touchAfterMs) {
      callback?.();
      return;
    }
    lastWritten.set(sid, at);
    touch(sid, session, (err?: unknown) => {
      if (err) lastWritten.delete(sid);
      callback?.(err);
    });
  };
  store.touch = throttled as Store['touch'];
  return store;
}
