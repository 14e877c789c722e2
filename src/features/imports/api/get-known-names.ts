import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** The company's builder and community names, to tell the user which names in the file are new. */
export const knownNamesQueryOptions = () =>
  queryOptions({
    queryKey: ['imports', 'known-names'],
    queryFn: async ({ signal }) => {
      const [b, c] = await Promise.all([
        api<{ builders: { name: string }[] }>('/api/builders', { signal }),
        api<{ communities: { name: string }[] }>('/api/communities', { signal }),
      ]);
      return { builders: b.builders.map((x) => x.name), communities: c.communities.map((x) => x.name) };
    },
  });

export const useKnownNames = () => useQuery(knownNamesQueryOptions());
