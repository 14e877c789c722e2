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

/** A home's detail by its short number, as a tap on the map names it; kept under its id as well. */
export async function fetchHomeByRef(queryClient: QueryClient, ref: number): Promise<HomeDetail> {
  const detail = await api<HomeDetail>(`/api/homes/ref/${ref}`);
  queryClient.setQueryData(homeQueryOptions(detail.home.id).queryKey, detail);
  return detail;
}

export const useHome = (id: string | null) => useQuery({ ...homeQueryOptions(id ?? ''), enabled: Boolean(id) });
