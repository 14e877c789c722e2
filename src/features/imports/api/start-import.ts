import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '@/lib/api-client';
import { ApiErrorBody } from '@shared/schemas/common';
import type { SessionResponse } from '@shared/schemas/auth';
import type { ColumnMapping, Delimiter, ImportDto } from '@shared/schemas/imports';
import { importsQueryOptions } from './get-imports';
import { importQueryOptions } from './get-import';

export interface StartImportInput {
  /** Generated once per chosen file: submitting twice answers with the same job. */
  id: string;
  file: File;
  mapping: ColumnMapping;
  delimiter: Delimiter;
  createBuilders: boolean;
  createCommunities: boolean;
}

/**
 * Sends the file itself as the body (`text/csv`); the server reads it as a stream. The one JSON wrapper
 * cannot send a file, so this fetcher asks the session for its CSRF token and decodes errors the same way.
 */
export async function startImport(input: StartImportInput): Promise<ImportDto> {
  const { csrfToken } = await api<SessionResponse>('/api/auth/session');
  const query = new URLSearchParams({
    id: input.id,
    fileName: input.file.name,
    mapping: JSON.stringify(input.mapping),
    delimiter: input.delimiter,
    createBuilders: String(input.createBuilders),
    createCommunities: String(input.createCommunities),
  });
  const res = await fetch(`/api/imports?${query}`, {
    method: 'POST',
    headers: { 'Content-Type': 'text/csv', Accept: 'application/json', ...(csrfToken ? { 'x-csrf-token': csrfToken } : {}) },
    body: input.file,
    credentials: 'same-origin',
  });
  const data: unknown = await res.json().catch(() => null);
  if (!res.ok) {
    const parsed = ApiErrorBody.safeParse(data);
    if (parsed.success) throw new ApiError(res.status, parsed.data.error.code, parsed.data.error.message, parsed.data.error.fields);
    throw new ApiError(res.status, `HTTP_${res.status}`, `The server answered ${res.status}`);
  }
  return (data as { import: ImportDto }).import;
}

export function useStartImport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: startImport,
    onSuccess: (job) => {
      queryClient.setQueryData(importQueryOptions(job.id).queryKey, job);
      void queryClient.invalidateQueries({ queryKey: importsQueryOptions().queryKey });
    },
  });
}
