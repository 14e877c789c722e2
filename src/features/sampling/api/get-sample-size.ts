import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SampleSizeDto } from '@shared/schemas/sampling';

export interface SizeParams {
  communityId: string;
  marginOfError: number;
  rateSource: 'assumed' | 'observed';
  expectedRate?: number;
}

export function sizeSearch(p: SizeParams): string {
  const q = new URLSearchParams({ communityId: p.communityId, marginOfError: String(p.marginOfError), rateSource: p.rateSource });
  if (p.rateSource === 'assumed' && p.expectedRate !== undefined) q.set('expectedRate', String(p.expectedRate));
  return `?${q}`;
}

export const sampleSizeQueryOptions = (p: SizeParams) =>
  queryOptions({
    queryKey: ['sampling', 'size', p],
    queryFn: ({ signal }) => api<{ size: SampleSizeDto }>(`/api/sampling/size${sizeSearch(p)}`, { signal }),
  });

export const useSampleSize = (p: SizeParams | null) =>
  useQuery({ ...sampleSizeQueryOptions(p ?? { communityId: '', marginOfError: 0.1, rateSource: 'assumed' }), enabled: Boolean(p?.communityId), placeholderData: keepPreviousData });
