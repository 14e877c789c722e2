import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SettingsDto } from '@shared/schemas/settings';

export const settingsQueryOptions = () =>
  queryOptions({ queryKey: ['settings'], queryFn: ({ signal }) => api<{ settings: SettingsDto }>('/api/settings', { signal }) });

export const useSettings = () => useQuery(settingsQueryOptions());

export function useUpdateSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: Partial<SettingsDto>) => api<{ settings: SettingsDto }>('/api/settings', { method: 'PATCH', body }),
    onSuccess: (data) => queryClient.setQueryData(settingsQueryOptions().queryKey, data),
  });
}
