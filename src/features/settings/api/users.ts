import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { Role } from '@shared/schemas/enums';
import type { UserDto } from '@shared/schemas/users';

export const usersQueryOptions = () =>
  queryOptions({ queryKey: ['users', 'list'], queryFn: ({ signal }) => api<{ users: UserDto[] }>('/api/users', { signal }) });

export const useUsers = () => useQuery(usersQueryOptions());

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; name: string; role: Role; password: string }) => api<{ user: UserDto }>('/api/users', { method: 'POST', body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersQueryOptions().queryKey }),
  });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: { id: string; role?: Role; active?: boolean }) => api<{ user: UserDto }>(`/api/users/${id}`, { method: 'PATCH', body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersQueryOptions().queryKey }),
  });
}
