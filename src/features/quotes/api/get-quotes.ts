import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { QuoteDto } from '@shared/schemas/quotes';

export const quotesQueryOptions = () =>
  queryOptions({ queryKey: ['quotes', 'list'], queryFn: ({ signal }) => api<{ quotes: QuoteDto[] }>('/api/quotes', { signal }) });

export const useQuotes = () => useQuery(quotesQueryOptions());

export const quoteQueryOptions = (id: string) =>
  queryOptions({ queryKey: ['quotes', 'detail', id], queryFn: ({ signal }) => api<{ quote: QuoteDto }>(`/api/quotes/${id}`, { signal }) });

export const useQuote = (id: string | null) => useQuery({ ...quoteQueryOptions(id ?? ''), enabled: Boolean(id) });
