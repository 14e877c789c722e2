import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { CommunityDto } from '@shared/schemas/communities';

export const communitiesQueryOptions = () =>
  queryOptions({
    queryKey: ['communities', 'list'],
    queryFn: ({ signal }) => api<{ communities: CommunityDto[] }>('/api/communities', { signal }),
  });

export const useCommunities = () => useQuery(communitiesQueryOptions());
