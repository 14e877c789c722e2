import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api-client';
import { forgetSessionUser, sessionQueryOptions } from './get-session';

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>('/api/auth/sign-out', { method: 'POST' }),
    onSettled: () => {
      setCsrfToken(null);
      forgetSessionUser();
      queryClient.clear();
      queryClient.setQueryData(sessionQueryOptions().queryKey, { user: null, csrfToken: null });
    },
  });
}
