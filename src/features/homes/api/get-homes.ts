import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { HomeDto } from '@shared/schemas/homes';

export type HomesFilter = { q?: string; communityId?: string; builderId?: string; outcome?: string; limit?: number; offset?: number };

export function getHomes(filter: HomesFilter, signal?: AbortSignal) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filter)) if (v !== undefined && v !== '') params.set(k, String(v));
  return api<{ homes: HomeDto[]; total: number }>(`/api/homes?${params}`, { signal });
}

export const homesQueryOptions = (filter: HomesFilter) =>
  queryOptions({ queryKey: ['homes', 'list', filter], queryFn: ({ signal }) => getHomes(filter, signal), placeholderData: keepPreviousData });

export const useHomes = (filter: HomesFilter) => useQuery(homesQueryOptions(filter));
