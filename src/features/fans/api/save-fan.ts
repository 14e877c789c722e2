import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import type { FanBody, FanDto } from '@shared/schemas/visits';
import { fansQueryOptions } from './get-fans';

export type FanInput = z.input<typeof FanBody>;

/** Adds a fan (no id) or replaces a fan's name and curve; the visit form's fan list refreshes through the same key. */
export function useSaveFan() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id?: string; body: FanInput }) =>
      api<{ fan: FanDto }>(id ? `/api/fans/${id}` : '/api/fans', { method: id ? 'PUT' : 'POST', body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: fansQueryOptions().queryKey }),
  });
}
