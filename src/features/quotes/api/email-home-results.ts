import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SentMailDto } from '@shared/schemas/quotes';

export function useEmailHomeResults() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ homeId, recipientEmail }: { homeId: string; recipientEmail: string }) =>
      api<{ sent: SentMailDto }>(`/api/home-results/${homeId}/email`, { method: 'POST', body: { recipientEmail } }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['mail', 'outbox'] }),
  });
}
