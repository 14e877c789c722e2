import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { HomeDto } from '@shared/schemas/homes';

export interface HomeDetail {
  home: HomeDto;
  visits: { id: string; visitedOn: string; status: string; vacuumPa: number | null; subSlabMaterial: string; reworkNeeded: boolean; reworkDone: boolean; reworkReasons: string[]; notes: string }[];
  tests: { id: string; kind: string; device: string; startedAt: string; endedAt: string; resultBqM3: number; sideBySideGroup: string | null }[];
  /** In its community's latest sampling plan and not yet visited. */
  planned: boolean;
}

export const homeQueryOptions = (id: string) =>
  queryOptions({ queryKey: ['homes', 'detail', id], queryFn: ({ signal }) => api<HomeDetail>(`/api/homes/${id}`, { signal }) });

export const useHome = (id: string | null) => useQuery({ ...homeQueryOptions(id ?? ''), enabled: Boolean(id) });
