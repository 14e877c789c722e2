import { Field } from '@/components/ui/field';
import type { BuilderComparisonQuery } from '@shared/schemas/insight';

export function ComparisonFilters({
  filters,
  builders,
  communities,
  onChange,
}: {
  filters: BuilderComparisonQuery;
  builders: { id: string; name: string }[];
  communities: { id: string; name: string }[];
  onChange(patch: Partial<Record<keyof BuilderComparisonQuery, string | undefined>>): void;
}) {
  return (
    <form className="grid grid-cols-2 gap-3 sm:grid-cols-4" onSubmit={(e) => e.preventDefault()} aria-label="Filters">
      <Field label="Builder">
        <select value={filters.builderId ?? ''} onChange={(e) => onChange({ builderId: e.target.value || undefined })}>
          <option value="">All builders</option>
          {builders.map((b) => (
            <option key={b.id} value={b.id}>{b.name}</option>
          ))}
        </select>
      </Field>
      <Field label="Community">
        <select value={filters.communityId ?? ''} onChange={(e) => onChange({ communityId: e.target.value || undefined })}>
          <option value="">All communities</option>
          {communities.map((c) => (
            <option key={c.id} value={c.id}>{c.name}</option>
          ))}
        </select>
      </Field>
      <Field label="Built from">
        <input type="number" inputMode="numeric" min={1800} max={2100} value={filters.yearFrom ?? ''} onChange={(e) => onChange({ yearFrom: e.target.value || undefined })} />
      </Field>
      <Field label="Built to">
        <input type="number" inputMode="numeric" min={1800} max={2100} value={filters.yearTo ?? ''} onChange={(e) => onChange({ yearTo: e.target.value || undefined })} />
      </Field>
    </form>
  );
}
