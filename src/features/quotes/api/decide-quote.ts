import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuoteDto } from '@shared/schemas/quotes';
import { refreshQuote } from './refresh';

export function useDecideQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, decision }: { id: string; decision: 'accepted' | 'declined' }) =>
      api<{ quote: QuoteDto }>(`/api/quotes/${id}/decision`, { method: 'POST', body: { decision } }),
    onSuccess: ({ quote }) => refreshQuote(queryClient, quote),
  });
}
