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

/** Where a session read by readUserWithSession carries its user, from the store to the request. */
const USER_READ_WITH_SESSION = Symbol('user read with the session');
type WithUser = { [USER_READ_WITH_SESSION]?: unknown };

/**
 * One round trip for a signed-in request instead of two: `read` loads a stored session and its
 * signed-in user in one statement (null when the user is gone or may not sign in). express-session
 * reads the session; passport then asks for the user, and gets the one read with the session through
 * `userReadWithSession`. The user is still read on every request, so a changed role or a deactivated
 * account takes effect at once.
 */
export function readUserWithSession<S extends Store, U>(
  store: S,
  read: (sid: string) => Promise<{ sess: unknown; user: U | null } | undefined>,
): S {
  store.get = (sid, callback) => {
    read(sid).then(
      (found) => {
        if (!found) return callback(null, null);
        let sess: Record<string, unknown>;
        try {
          sess = typeof found.sess === 'string' ? JSON.parse(found.sess) : (found.sess as Record<string, unknown>);
        } catch {
          return store.destroy(sid, (err?: unknown) => callback(err));
        }
        // A stored value that is not an object (null, a number) is no session: drop it, as unreadable JSON is.
        if (sess === null || typeof sess !== 'object') return store.destroy(sid, (err?: unknown) => callback(err));
        // Not enumerable: express-session neither copies nor saves it; createSession hands it to the request.
        Object.defineProperty(sess, USER_READ_WITH_SESSION, { value: found.user, enumerable: false });
        callback(null, sess as never);
      },
      (err: unknown) => callback(err),
    );
  };
  const createSession = store.createSession.bind(store);
  store.createSession = (req, sess) => {
    const user = (sess as WithUser)[USER_READ_WITH_SESSION];
    if (user !== undefined) (req as WithUser)[USER_READ_WITH_SESSION] = user;
    return createSession(req, sess);
  };
  return store;
}

/**
 * The user read with this request's session (see readUserWithSession), taken once: the user, null when
 * the session's user is gone or may not sign in, or undefined when it was not read with the session
 * and must be loaded.
 */
export function userReadWithSession<U extends { id: string }>(req: object, id: string): U | null | undefined {
  const holder = req as WithUser;
  const user = holder[USER_READ_WITH_SESSION] as U | null | undefined;
  delete holder[USER_READ_WITH_SESSION];
  if (user === null) return null;
  return user?.id === id ? user : undefined;
}
