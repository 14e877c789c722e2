import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuoteDto } from '@shared/schemas/quotes';
import { refreshQuote } from './refresh';

export function useSendQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, recipientEmail }: { id: string; recipientEmail?: string }) =>
      api<{ quote: QuoteDto }>(`/api/quotes/${id}/send`, { method: 'POST', body: recipientEmail ? { recipientEmail } : {} }),
    onSuccess: ({ quote }) => refreshQuote(queryClient, quote),
  });
}
