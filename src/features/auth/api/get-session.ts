import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api-client';
import type { SessionResponse } from '@shared/schemas/auth';

export async function getSession(): Promise<SessionResponse> {
  const session = await api<SessionResponse>('/api/auth/session');
  setCsrfToken(session.csrfToken);
  return session;
}

export const sessionQueryOptions = () => queryOptions({ queryKey: ['auth', 'session'], queryFn: getSession, staleTime: 5 * 60_000 });

export const useSession = () => useQuery(sessionQueryOptions());
