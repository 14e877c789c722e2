import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { BuilderDto } from '@shared/schemas/builders';
import { buildersQueryOptions } from './get-builders';

export function useSaveBuilder() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: { id?: string; name: string; notes: string }) =>
      api<{ builder: BuilderDto }>(id ? `/api/builders/${id}` : '/api/builders', { method: id ? 'PATCH' : 'POST', body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: buildersQueryOptions().queryKey }),
  });
}

export function useDeleteBuilder() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<void>(`/api/builders/${id}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: buildersQueryOptions().queryKey }),
  });
}
