import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { BuilderComparisonDto, BuilderComparisonQuery } from '@shared/schemas/insight';

export function comparisonSearch(filters: BuilderComparisonQuery): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(filters)) if (v !== undefined && v !== '') q.set(k, String(v));
  const s = q.toString();
  return s ? `?${s}` : '';
}

export const builderComparisonQueryOptions = (filters: BuilderComparisonQuery) =>
  queryOptions({
    queryKey: ['insight', 'builders', filters],
    queryFn: ({ signal }) => api<BuilderComparisonDto>(`/api/insight/builders${comparisonSearch(filters)}`, { signal }),
  });

export const useBuilderComparison = (filters: BuilderComparisonQuery) => useQuery(builderComparisonQueryOptions(filters));
