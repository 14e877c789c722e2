import { useCommunities } from '../api/get-communities';
import { ErrorNote } from '@/components/ui/error-note';
import { EmptyState } from '@/components/ui/empty-state';

export function CommunitiesTable({ builderNames }: { builderNames: Map<string, string> }) {
  const { data, error, isPending } = useCommunities();
  if (error) return <ErrorNote error={error} />;
  if (isPending) return <p className="text-muted">Loading communities…</p>;
  if (data.communities.length === 0) return <EmptyState title="No communities yet">Import addresses to start a community.</EmptyState>;
  return (
    <div className="overflow-x-auto rounded-md border border-rule bg-panel">
      <table className="data w-full text-left text-sm">
        <thead>
          <tr className="border-b border-rule">
            <th className="p-2">Community</th>
            <th className="p-2">Builders</th>
            <th className="p-2 text-right">Built</th>
            <th className="p-2 text-right">Homes</th>
            <th className="p-2">Passive system required</th>
            <th className="p-2">Jurisdiction</th>
          </tr>
        </thead>
        <tbody className="tabular">
          {data.communities.map((c) => (
            <tr key={c.id} className="border-b border-rule/60">
              <td className="p-2 font-medium">{c.name}</td>
              <td className="p-2">{c.builderIds.map((id) => builderNames.get(id) ?? '?').join(', ') || '—'}</td>
              <td className="p-2 text-right">{c.yearFrom && c.yearTo ? `${c.yearFrom}–${c.yearTo}` : '—'}</td>
              <td className="p-2 text-right">{c.homeCount}</td>
              <td className="p-2">{c.passiveRequired == null ? 'Unknown' : c.passiveRequired ? 'Yes' : 'No'}</td>
              <td className="p-2">{c.jurisdiction || '—'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
