import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuoteDto } from '@shared/schemas/quotes';
import { refreshQuote } from './refresh';

export function useApproveQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<{ quote: QuoteDto }>(`/api/quotes/${id}/approve`, { method: 'POST' }),
    onSuccess: ({ quote }) => refreshQuote(queryClient, quote),
  });
}
