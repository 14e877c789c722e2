import { useEffect } from 'react';
import { Link } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import type { ImportDto } from '@shared/schemas/imports';
import { ErrorNote } from '@/components/ui/error-note';
import { useImport } from '../api/get-import';
import { importsQueryOptions } from '../api/get-imports';

const STAGES: { status: ImportDto['status']; label: string }[] = [
  { status: 'receiving', label: 'Reading the file' },
  { status: 'geocoding', label: 'Finding addresses' },
  { status: 'assigning', label: 'Assigning communities' },
  { status: 'writing', label: 'Saving' },
];

function Bar({ label, done, total }: { label: string; done: number; total: number | null }) {
  const pct = total ? Math.min(100, Math.round((done / total) * 100)) : null;
  return (
    <div className="text-sm">
      <div className="flex justify-between">
        <span>{label}</span>
        <span className="tabular text-muted">
          {done.toLocaleString()} {total !== null ? `of ${total.toLocaleString()} rows` : 'rows'}
        </span>
      </div>
      <div className="mt-1 h-2 rounded bg-rule" role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct ?? undefined}>
        <div className="h-2 rounded bg-accent transition-all" style={{ width: `${pct ?? 100}%`, opacity: pct === null ? 0.4 : 1 }} />
      </div>
    </div>
  );
}

/** Polls a running import and shows its stages; once finished, the counts and the rows with problems. */
export function ImportStatus({ id }: { id: string }) {
  const { data: job, error } = useImport(id);
  const queryClient = useQueryClient();
  const status = job?.status;
  // When the job ends, the history and anything showing homes must catch up.
  useEffect(() => {
    if (status === 'committed' || status === 'failed') {
      void queryClient.invalidateQueries({ queryKey: importsQueryOptions().queryKey });
      if (status === 'committed') void queryClient.invalidateQueries({ queryKey: ['homes'] });
    }
  }, [status, queryClient]);
  if (error) return <ErrorNote error={error} />;
  if (!job) return <p className="text-muted">Uploading…</p>;
  if (job.status === 'failed') {
    return (
      <div role="alert" className="rounded-md border border-state-bad/40 bg-state-bad/5 p-3 text-sm">
        <p className="font-medium">Nothing was imported.</p>
        <p>{job.failure?.message}</p>
        {job.failure?.fields && (
          <ul className="mt-1 list-disc pl-5 text-muted">
            {job.failure.fields.map((f) => (
              <li key={f.field}>{f.message}</li>
            ))}
          </ul>
        )}
      </div>
    );
  }
  if (job.status !== 'committed' && job.status !== 'undone') {
    const stage = STAGES.findIndex((s) => s.status === job.status);
    const p = job.progress;
    return (
      <section aria-label="Import progress" className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4">
        <p className="font-medium" aria-live="polite">
          {STAGES[stage]?.label ?? 'Working'}…
        </p>
        <Bar label="Rows read" done={p.rowsParsed} total={null} />
        {p.rowsToGeocode > 0 && <Bar label="Addresses geocoded" done={p.rowsGeocoded} total={p.rowsToGeocode} />}
        <Bar label="Homes saved" done={p.rowsWritten} total={p.rowsToWrite || null} />
        <p className="text-xs text-muted">All rows are saved together at the end: if anything stops the import, nothing is half-written.</p>
      </section>
    );
  }
  return <ImportResult job={job} />;
}

export function ImportResult({ job }: { job: ImportDto }) {
  const c = job.counts!;
  return (
    <section aria-label="Import result" className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4">
      <p className="font-medium" data-testid="import-result">
        {job.status === 'undone' ? 'Undone. ' : 'Imported. '}
        {c.inserted.toLocaleString()} new, {c.updated.toLocaleString()} updated, {c.unchanged.toLocaleString()} unchanged, {c.rejected.toLocaleString()} with problems.
      </p>
      {(job.created.builders.length > 0 || job.created.communities.length > 0) && (
        <p className="text-sm text-muted">
          Created {[...job.created.builders.map((b) => `builder “${b}”`), ...job.created.communities.map((x) => `community “${x}”`)].join(', ')}.
        </p>
      )}
      <div className="flex flex-wrap gap-3 text-sm">
        {c.inserted + c.updated > 0 && job.status === 'committed' && (
          <Link to="/" className="text-accent underline">
            See the homes on the map
          </Link>
        )}
        {job.errorCount > 0 && (
          <a href={`/api/imports/${job.id}/errors.csv`} className="text-accent underline" download>
            Download the {job.errorCount === 1 ? 'row' : 'rows'} with problems (CSV) to fix and import again
          </a>
        )}
      </div>
      {job.errors.length > 0 && <RowErrors job={job} />}
    </section>
  );
}

export function RowErrors({ job }: { job: ImportDto }) {
  return (
    <div className="max-h-96 overflow-auto">
      <table className="w-full text-left text-sm" aria-label="Rows with problems">
        <thead className="sticky top-0 bg-panel">
          <tr className="border-b border-rule">
            <th className="p-2">Row</th>
            <th className="p-2">Column</th>
            <th className="p-2">Problem</th>
          </tr>
        </thead>
        <tbody className="tabular">
          {job.errors.map((e, i) => (
            <tr key={`${e.row}-${i}`} className="border-b border-rule/60 align-top">
              <td className="p-2">{e.row}</td>
              <td className="p-2">{e.field}</td>
              <td className="p-2">{e.reason}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {job.errorCount > job.errors.length && (
        <p className="p-2 text-sm text-muted">
          {(job.errorCount - job.errors.length).toLocaleString()} more in the CSV download.
        </p>
      )}
    </div>
  );
}
