import { useState } from 'react';
import { useHomes } from '../api/get-homes';
import { OutcomeBadge } from './outcome-badge';
import { ErrorNote } from '@/components/ui/error-note';
import { EmptyState } from '@/components/ui/empty-state';
import { Button } from '@/components/ui/button';

const PAGE = 50;

export function HomesTable() {
  const [q, setQ] = useState('');
  const [offset, setOffset] = useState(0);
  const { data, error, isPending } = useHomes({ q, limit: PAGE, offset });
  return (
    <div className="flex flex-col gap-3">
      <input
        type="search"
        aria-label="Search by address"
        placeholder="Search by address"
        className="min-h-11 rounded-md border border-rule bg-panel px-3"
        value={q}
        onChange={(e) => {
          setQ(e.target.value);
          setOffset(0);
        }}
      />
      {error && <ErrorNote error={error} />}
      {isPending && <p className="text-muted">Loading homes…</p>}
      {data && data.total === 0 && <EmptyState title="No homes match">Import addresses to start a community.</EmptyState>}
      {data && data.total > 0 && (
        <>
          <div className="overflow-x-auto rounded-md border border-rule bg-panel">
            <table className="data w-full text-left text-sm">
              <thead>
                <tr className="border-b border-rule">
                  <th className="p-2">Address</th>
                  <th className="p-2">Community</th>
                  <th className="p-2">Builder</th>
                  <th className="p-2 text-right">Built</th>
                  <th className="p-2">Outcome</th>
                </tr>
              </thead>
              <tbody className="tabular">
                {data.homes.map((h) => (
                  <tr key={h.id} className="border-b border-rule/60">
                    <td className="p-2">{h.address}</td>
                    <td className="p-2">{h.communityName ?? '—'}</td>
                    <td className="p-2">{h.builderName ?? '—'}</td>
                    <td className="p-2 text-right">{h.yearBuilt ?? '—'}</td>
                    <td className="p-2"><OutcomeBadge outcome={h.outcome} /></td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="flex items-center gap-3 text-sm">
            <Button variant="secondary" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - PAGE))}>Previous</Button>
            <span className="tabular text-muted">
              {offset + 1}–{Math.min(offset + PAGE, data.total)} of {data.total}
            </span>
            <Button variant="secondary" disabled={offset + PAGE >= data.total} onClick={() => setOffset(offset + PAGE)}>Next</Button>
          </div>
        </>
      )}
    </div>
  );
}
