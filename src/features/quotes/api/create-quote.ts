import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuoteDto } from '@shared/schemas/quotes';
import { refreshQuote } from './refresh';

export function useCreateQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { communityId: string; pooled: boolean; recipientEmail: string | null }) => api<{ quote: QuoteDto }>('/api/quotes', { method: 'POST', body }),
    onSuccess: ({ quote }) => refreshQuote(queryClient, quote),
  });
}
