import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, ApiError } from '@/lib/api-client';
import type { ImportDto } from '@shared/schemas/imports';

const FINISHED = new Set(['committed', 'failed', 'undone']);

export const importQueryOptions = (id: string) =>
  queryOptions({
    queryKey: ['imports', 'detail', id],
    queryFn: ({ signal }) => api<{ import: ImportDto }>(`/api/imports/${id}`, { signal }).then((r) => r.import),
    // Progress: poll while the job runs (the upload itself registers the job, so this works during the upload too).
    refetchInterval: (query) => (query.state.data && FINISHED.has(query.state.data.status) ? false : 400),
    // The job appears a moment after the upload starts: a 404 until then is not an error.
    retry: (count, error) => error instanceof ApiError && error.status === 404 && count < 50,
    retryDelay: 200,
  });

export const useImport = (id: string | null) => useQuery({ ...importQueryOptions(id ?? ''), enabled: Boolean(id) });
