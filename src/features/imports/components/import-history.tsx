import { useState } from 'react';
import type { ImportDto } from '@shared/schemas/imports';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorNote } from '@/components/ui/error-note';
import { useImports } from '../api/get-imports';
import { useUndoImport } from '../api/undo-import';
import { RowErrors } from './import-status';

const when = (iso: string) => new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** Every import of the company: who, when, which file, what it did, its problems, and undo. */
export function ImportHistory() {
  const { data, error, isPending } = useImports();
  const undo = useUndoImport();
  const [open, setOpen] = useState<string | null>(null);

  function confirmUndo(job: ImportDto) {
    const c = job.counts!;
    const ok = window.confirm(
      `Undo the import of ${job.fileName}? It removes the ${c.inserted} homes it added and puts back the ${c.updated} it changed as they were.`,
    );
    if (ok) undo.mutate(job.id);
  }

  if (error) return <ErrorNote error={error} />;
  if (isPending) return <p className="text-muted">Loading imports…</p>;
  if (!data.imports.length) return <EmptyState title="No imports yet">Import addresses to start a community.</EmptyState>;
  return (
    <div className="flex flex-col gap-2">
      {undo.error && <ErrorNote error={undo.error} />}
      <div className="overflow-x-auto">
        <table className="w-full rounded-md border border-rule bg-panel text-left text-sm" aria-label="Import history">
          <thead className="sticky top-0 bg-panel">
            <tr className="border-b border-rule">
              <th className="p-2">When</th>
              <th className="p-2">Who</th>
              <th className="p-2">File</th>
              <th className="p-2 text-right">Rows</th>
              <th className="p-2 text-right">New</th>
              <th className="p-2 text-right">Updated</th>
              <th className="p-2 text-right">Unchanged</th>
              <th className="p-2 text-right">Problems</th>
              <th className="p-2">Status</th>
              <th className="p-2" />
            </tr>
          </thead>
          <tbody className="tabular">
            {data.imports.map((job) => (
              <HistoryRow
                key={job.id}
                job={job}
                open={open === job.id}
                onToggle={() => setOpen(open === job.id ? null : job.id)}
                onUndo={() => confirmUndo(job)}
                undoing={undo.isPending && undo.variables === job.id}
              />
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function HistoryRow({ job, open, onToggle, onUndo, undoing }: { job: ImportDto; open: boolean; onToggle(): void; onUndo(): void; undoing: boolean }) {
  const c = job.counts;
  const status =
    job.status === 'committed' ? 'Imported' : job.status === 'undone' ? `Undone ${job.undoneAt ? when(job.undoneAt) : ''}` : job.status === 'failed' ? 'Stopped: nothing saved' : 'Running…';
  return (
    <>
      <tr className="border-b border-rule/60 align-top">
        <td className="p-2 whitespace-nowrap">{when(job.createdAt)}</td>
        <td className="p-2">{job.userName ?? '—'}</td>
        <td className="p-2">{job.fileName}</td>
        <td className="p-2 text-right">{c?.rows.toLocaleString() ?? ''}</td>
        <td className="p-2 text-right">{c?.inserted.toLocaleString() ?? ''}</td>
        <td className="p-2 text-right">{c?.updated.toLocaleString() ?? ''}</td>
        <td className="p-2 text-right">{c?.unchanged.toLocaleString() ?? ''}</td>
        <td className="p-2 text-right">
          {c && c.rejected > 0 ? (
            <button className="text-accent underline" onClick={onToggle} aria-expanded={open}>
              {c.rejected.toLocaleString()}
            </button>
          ) : (
            (c?.rejected ?? '')
          )}
        </td>
        <td className="p-2">{job.status === 'failed' ? <span title={job.failure?.message}>{status}</span> : status}</td>
        <td className="p-2 whitespace-nowrap text-right">
          {c && c.rejected > 0 && (job.status === 'committed' || job.status === 'undone') && (
            <a className="mr-3 text-accent underline" href={`/api/imports/${job.id}/errors.csv`} download>
              Problems CSV
            </a>
          )}
          {job.status === 'committed' && (
            <button className="text-state-bad underline disabled:opacity-50" onClick={onUndo} disabled={undoing}>
              Undo
            </button>
          )}
        </td>
      </tr>
      {open && (
        <tr>
          <td colSpan={10} className="p-2">
            <ImportErrorsPanel job={job} />
          </td>
        </tr>
      )}
    </>
  );
}

function ImportErrorsPanel({ job }: { job: ImportDto }) {
  // The list shows the first problems; the CSV has them all.
  return <RowErrors job={job} />;
}
