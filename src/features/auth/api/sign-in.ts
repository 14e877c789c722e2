import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api-client';
import type { SessionResponse } from '@shared/schemas/auth';
import { rememberUser, sessionQueryOptions } from './get-session';

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; password: string }) => api<SessionResponse>('/api/auth/sign-in', { method: 'POST', body }),
    onSuccess: (session) => {
      setCsrfToken(session.csrfToken);
      rememberUser(session);
      queryClient.clear();
      queryClient.setQueryData(sessionQueryOptions().queryKey, session);
    },
  });
}
