import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { FanDto } from '@shared/schemas/visits';

interface FansResponse {
  fans: FanDto[];
}

// The fan list rarely changes and the visit form must open without a connection: keep the last copy.
const CACHE_KEY = 'tractwise.fans';

function cachedFans(): FansResponse | undefined {
  try {
    const raw = localStorage.getItem(CACHE_KEY);
    return raw ? (JSON.parse(raw) as FansResponse) : undefined;
  } catch {
    return undefined;
  }
}

export async function getFans(signal?: AbortSignal): Promise<FansResponse> {
  const data = await api<FansResponse>('/api/fans', { signal });
  try {
    localStorage.setItem(CACHE_KEY, JSON.stringify(data));
  } catch {
    /* storage full or disabled: the list still works for this page */
  }
  return data;
}

export const fansQueryOptions = () =>
  queryOptions({
    queryKey: ['fans'],
    queryFn: ({ signal }) => getFans(signal),
    staleTime: 10 * 60_000,
    initialData: cachedFans,
    // The device's copy is shown at once but always counts as stale, so an online form refreshes it.
    initialDataUpdatedAt: 0,
  });

export const useFans = () => useQuery(fansQueryOptions());
