import { ApiError } from '@/lib/api-client';

/** The one way an error reaches the user: the server's message plus the failing fields, if any. */
export function ErrorNote({ error }: { error: unknown }) {
  const message = error instanceof Error ? error.message : 'Something went wrong';
  const fields = error instanceof ApiError ? error.fields : [];
  return (
    <div role="alert" className="rounded-md border border-state-bad/40 bg-state-bad/5 p-3 text-sm text-ink">
      <p>{message}</p>
      {fields.length > 0 && (
        <ul className="mt-1 list-disc pl-5 text-muted">
          {fields.map((f) => (
            <li key={f.field}>
              <code>{f.field}</code>: {f.message}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
