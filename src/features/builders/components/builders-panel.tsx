import { useState, type FormEvent } from 'react';
import { useBuilders } from '../api/get-builders';
import { useDeleteBuilder, useSaveBuilder } from '../api/save-builder';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { ErrorNote } from '@/components/ui/error-note';
import { EmptyState } from '@/components/ui/empty-state';

export function BuildersPanel({ canEdit }: { canEdit: boolean }) {
  const { data, error, isPending } = useBuilders();
  const save = useSaveBuilder();
  const remove = useDeleteBuilder();
  const [name, setName] = useState('');
  const [notes, setNotes] = useState('');

  function submit(e: FormEvent) {
    e.preventDefault();
    save.mutate({ name, notes }, { onSuccess: () => { setName(''); setNotes(''); } });
  }

  return (
    <div className="grid gap-6 md:grid-cols-[1fr_20rem]">
      <div>
        {error && <ErrorNote error={error} />}
        {isPending && <p className="text-muted">Loading builders…</p>}
        {data?.builders.length === 0 && <EmptyState title="No builders yet">Add the builders whose homes you survey.</EmptyState>}
        {data && data.builders.length > 0 && (
          <table className="data w-full rounded-md border border-rule bg-panel text-left text-sm">
            <thead>
              <tr className="border-b border-rule">
                <th className="p-2">Builder</th>
                <th className="p-2 text-right">Homes</th>
                <th className="p-2">Notes</th>
                {canEdit && <th className="p-2" />}
              </tr>
            </thead>
            <tbody className="tabular">
              {data.builders.map((b) => (
                <tr key={b.id} className="border-b border-rule/60">
                  <td className="p-2 font-medium">{b.name}</td>
                  <td className="p-2 text-right">{b.homeCount}</td>
                  <td className="p-2 text-muted">{b.notes}</td>
                  {canEdit && (
                    <td className="p-2 text-right">
                      <button
                        className="text-sm text-state-bad underline"
                        onClick={() => window.confirm(`Remove ${b.name}? Its homes keep their addresses but lose the builder.`) && remove.mutate(b.id)}
                      >
                        Remove
                      </button>
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
      {canEdit && (
        <form onSubmit={submit} className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4" aria-label="Add a builder">
          <h2 className="font-semibold">Add a builder</h2>
          <Field label="Name"><input required value={name} onChange={(e) => setName(e.target.value)} /></Field>
          <Field label="Notes"><textarea rows={3} value={notes} onChange={(e) => setNotes(e.target.value)} /></Field>
          {save.error && <ErrorNote error={save.error} />}
          <Button type="submit" disabled={save.isPending}>Add builder</Button>
        </form>
      )}
    </div>
  );
}
