import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SentMailDto } from '@shared/schemas/quotes';

/** Development only: the server answers 404 in production, and the panel hides itself. */
export const outboxQueryOptions = () =>
  queryOptions({ queryKey: ['mail', 'outbox'], queryFn: ({ signal }) => api<{ messages: SentMailDto[] }>('/api/mail/outbox', { signal }), retry: false });

export const useOutbox = () => useQuery(outboxQueryOptions());
