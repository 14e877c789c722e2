import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { HomeDto } from '@shared/schemas/homes';

export const homeSearchQueryOptions = (q: string) =>
  queryOptions({
    queryKey: ['homes', 'list', { q, limit: 8 }],
    queryFn: ({ signal }) => api<{ homes: HomeDto[]; total: number }>(`/api/homes?limit=8&q=${encodeURIComponent(q)}`, { signal }),
  });

export const useHomeSearch = (q: string) => useQuery({ ...homeSearchQueryOptions(q), enabled: q.trim().length >= 2, placeholderData: keepPreviousData });
