import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api-client';
import type { SessionResponse } from '@shared/schemas/auth';

// Who was signed in on this device, so the app (served by the service worker) opens without a connection.
// Only the user's own name and role are kept; the server still checks every request, and writes made
// offline wait in the outbox until a real session sends them with a fresh CSRF token.
const LAST_USER_KEY = 'tractwise.lastSessionUser';

/** Keeps the signed-in user on the device (called on every session read and at sign-in). */
export function rememberUser(session: SessionResponse) {
  try {
    if (session.user) localStorage.setItem(LAST_USER_KEY, JSON.stringify(session.user));
    else localStorage.removeItem(LAST_USER_KEY);
  } catch {
    /* storage disabled: the app then needs a connection to open */
  }
}

function lastUser(): SessionResponse['user'] {
  try {
    const raw = localStorage.getItem(LAST_USER_KEY);
    return raw ? (JSON.parse(raw) as SessionResponse['user']) : null;
  } catch {
    return null;
  }
}

/** Forgets the remembered user (sign-out). */
export function forgetSessionUser() {
  try {
    localStorage.removeItem(LAST_USER_KEY);
  } catch {
    /* nothing kept */
  }
}

export async function getSession(): Promise<SessionResponse> {
  let session: SessionResponse;
  try {
    session = await api<SessionResponse>('/api/auth/session');
  } catch (err) {
    // fetch throws a TypeError when there is no connection at all; an answer from the server is never masked.
    const user = err instanceof TypeError ? lastUser() : null;
    if (user) return { user, csrfToken: null };
    throw err;
  }
  setCsrfToken(session.csrfToken);
  rememberUser(session);
  return session;
}

export const sessionQueryOptions = () =>
  queryOptions({
    queryKey: ['auth', 'session'],
    queryFn: getSession,
    // A session made up offline (no CSRF token) is stale at once, so it is read again on reconnect.
    staleTime: (query) => (query.state.data?.user && query.state.data.csrfToken === null ? 0 : 5 * 60_000),
    // Try even when the browser says it is offline (the fallback above answers), instead of pausing the
    // route guard until a connection returns.
    networkMode: 'offlineFirst',
  });

export const useSession = () => useQuery(sessionQueryOptions());
