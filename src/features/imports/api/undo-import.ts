import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ImportDto } from '@shared/schemas/imports';
import { importsQueryOptions } from './get-imports';
import { importQueryOptions } from './get-import';

export function useUndoImport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<{ import: ImportDto }>(`/api/imports/${id}/undo`, { method: 'POST' }).then((r) => r.import),
    onSuccess: (job) => {
      queryClient.setQueryData(importQueryOptions(job.id).queryKey, job);
      void queryClient.invalidateQueries({ queryKey: importsQueryOptions().queryKey });
      // Homes came and went: lists elsewhere refetch when next shown.
      void queryClient.invalidateQueries({ queryKey: ['homes'] });
    },
  });
}
