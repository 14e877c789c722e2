import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { BuilderDto } from '@shared/schemas/builders';

export const buildersQueryOptions = () =>
  queryOptions({ queryKey: ['builders', 'list'], queryFn: ({ signal }) => api<{ builders: BuilderDto[] }>('/api/builders', { signal }) });

export const useBuilders = () => useQuery(buildersQueryOptions());
