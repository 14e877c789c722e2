import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ImportDto } from '@shared/schemas/imports';

export const importsQueryOptions = () =>
  queryOptions({
    queryKey: ['imports', 'list'],
    queryFn: ({ signal }) => api<{ imports: ImportDto[] }>('/api/imports', { signal }),
  });

export const useImports = () => useQuery(importsQueryOptions());
