import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { headerKey } from '@shared/domain/csv';
import type { MappingSuggestionDto } from '@shared/schemas/imports';

/** The mapping remembered for a file with these headers, else a guess from the header names. */
export const mappingSuggestionQueryOptions = (headers: string[]) =>
  queryOptions({
    queryKey: ['imports', 'mapping', headerKey(headers)],
    queryFn: ({ signal }) => api<MappingSuggestionDto>('/api/imports/mapping-suggestions', { method: 'POST', body: { headers }, signal }),
    staleTime: Infinity,
  });

export const useMappingSuggestion = (headers: string[] | null) =>
  useQuery({ ...mappingSuggestionQueryOptions(headers ?? []), enabled: Boolean(headers && headers.length) });
