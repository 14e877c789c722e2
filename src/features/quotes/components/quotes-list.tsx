import type { QuoteDto } from '@shared/schemas/quotes';
import { EmptyState } from '@/components/ui/empty-state';
import { money, STATUS_LABELS } from '../utils/format';

export function QuotesList({ quotes, selectedId, onSelect }: { quotes: QuoteDto[]; selectedId: string | null; onSelect(id: string): void }) {
  if (quotes.length === 0) return <EmptyState title="No quotes yet">Sample a few homes in a community, then price it here.</EmptyState>;
  return (
    <div className="max-h-[50vh] overflow-auto rounded-md border border-rule bg-panel">
      <table className="data w-full text-left text-sm">
        <thead>
          <tr className="border-b border-rule">
            <th className="p-2">Community</th>
            <th className="p-2">State</th>
            <th className="p-2 text-right">Price range</th>
            <th className="p-2 text-right">Created</th>
          </tr>
        </thead>
        <tbody className="tabular">
          {quotes.map((q) => (
            <tr key={q.id} className={`border-b border-rule/60 ${q.id === selectedId ? 'bg-paper' : ''}`}>
              <td className="p-2">
                <button className="min-h-11 text-left text-accent underline" onClick={() => onSelect(q.id)}>{q.communityName}</button>
                {q.pooled && <span className="ml-2 text-xs text-muted">pooled</span>}
              </td>
              <td className="p-2">{STATUS_LABELS[q.status]}</td>
              <td className="p-2 text-right whitespace-nowrap">{money(q.priceExpectedCents)} – {money(q.priceUpperCents)}</td>
              <td className="p-2 text-right">{q.createdAt.slice(0, 10)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
