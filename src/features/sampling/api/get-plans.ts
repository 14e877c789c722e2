import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SamplingPlanDto } from '@shared/schemas/sampling';

export type PlanSummary = Omit<SamplingPlanDto, 'homes'>;

export const plansQueryOptions = (communityId: string) =>
  queryOptions({
    queryKey: ['sampling', 'plans', 'list', communityId],
    queryFn: ({ signal }) => api<{ plans: PlanSummary[] }>(`/api/sampling/plans?communityId=${communityId}`, { signal }),
  });

export const usePlans = (communityId: string | null) => useQuery({ ...plansQueryOptions(communityId ?? ''), enabled: Boolean(communityId) });

export const planQueryOptions = (id: string) =>
  queryOptions({ queryKey: ['sampling', 'plans', 'detail', id], queryFn: ({ signal }) => api<{ plan: SamplingPlanDto }>(`/api/sampling/plans/${id}`, { signal }) });

export const usePlan = (id: string | null) => useQuery({ ...planQueryOptions(id ?? ''), enabled: Boolean(id) });
