import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SamplingPlanDto } from '@shared/schemas/sampling';
import type { SizeParams } from './get-sample-size';
import { planQueryOptions, plansQueryOptions } from './get-plans';

export function useCreatePlan() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SizeParams) => api<{ plan: SamplingPlanDto }>('/api/sampling/plans', { method: 'POST', body }),
    onSuccess: ({ plan }) => {
      queryClient.setQueryData(planQueryOptions(plan.id).queryKey, { plan });
      void queryClient.invalidateQueries({ queryKey: plansQueryOptions(plan.communityId).queryKey });
      // The map's home tiles and panels show planned homes.
      void queryClient.invalidateQueries({ queryKey: ['homes'] });
    },
  });
}
