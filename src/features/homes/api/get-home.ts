import { queryOptions, useQuery, type QueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { HomeDto } from '@shared/schemas/homes';
import type { RadonTestDto, VisitDto } from '@shared/schemas/visits';

export interface HomeDetail {
  home: HomeDto;
  visits: VisitDto[];
  tests: RadonTestDto[];
  /** In its community's latest sampling plan and not yet visited. */
  planned: boolean;
}

export const homeQueryOptions = (id: string) =>
  queryOptions({ queryKey: ['homes', 'detail', id], queryFn: ({ signal }) => api<HomeDetail>(`/api/homes/${id}`, { signal }) });

/**
 * A home's id from its short number, as a tap on the map names it. A home already opened on this
 * device answers from the query cache (so it opens without a connection); any other is asked of the
 * server, and its detail kept under its id.
 */
export async function homeIdByRef(queryClient: QueryClient, ref: number): Promise<string> {
  const known = queryClient
    .getQueriesData<HomeDetail>({ queryKey: ['homes', 'detail'] })
    .find(([, detail]) => detail?.home.ref === ref)?.[1];
  if (known) return known.home.id;
  const detail = await api<HomeDetail>(`/api/homes/ref/${ref}`);
  queryClient.setQueryData(homeQueryOptions(detail.home.id).queryKey, detail);
  return detail.home.id;
}

export const useHome = (id: string | null) => useQuery({ ...homeQueryOptions(id ?? ''), enabled: Boolean(id) });
