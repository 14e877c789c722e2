import { OUTCOMES, type Outcome } from '@shared/schemas/enums';
import { OUTCOME_LABELS } from '@shared/domain/outcome';
import type { MapFilters } from '../use-map-state';
import type { MapStyleMode } from '../layers/home-layers';

const STYLE_LABELS: Record<MapStyleMode, string> = {
  outcome: 'Outcome',
  vacuum: 'Manometer vacuum',
  post: 'Post-mitigation level',
  rework: 'Rework needed',
};

const select = 'min-h-11 w-full rounded-md border border-rule bg-panel px-2 text-sm';

export function MapFiltersPanel({
  filters,
  styleMode,
  builders,
  communities,
  onChange,
}: {
  filters: MapFilters;
  styleMode: MapStyleMode;
  builders: { id: string; name: string }[];
  communities: { id: string; name: string }[];
  onChange(patch: Record<string, string | undefined>): void;
}) {
  const toggleOutcome = (o: Outcome) => {
    const current = new Set(filters.outcome ?? []);
    if (current.has(o)) current.delete(o);
    else current.add(o);
    onChange({ outcome: [...current].join(',') || undefined });
  };
  return (
    <form aria-label="Map filters" className="flex flex-col gap-3 text-sm" onSubmit={(e) => e.preventDefault()}>
      <label className="flex flex-col gap-1">
        <span className="font-medium">Show homes by</span>
        <select className={select} value={styleMode} onChange={(e) => onChange({ style: e.target.value === 'outcome' ? undefined : e.target.value })}>
          {(Object.keys(STYLE_LABELS) as MapStyleMode[]).map((m) => <option key={m} value={m}>{STYLE_LABELS[m]}</option>)}
        </select>
      </label>
      <label className="flex flex-col gap-1">
        <span className="font-medium">Builder</span>
        <select className={select} value={filters.builderId ?? ''} onChange={(e) => onChange({ builderId: e.target.value || undefined })}>
          <option value="">All builders</option>
          {builders.map((b) => <option key={b.id} value={b.id}>{b.name}</option>)}
        </select>
      </label>
      <label className="flex flex-col gap-1">
        <span className="font-medium">Community</span>
        <select className={select} value={filters.communityId ?? ''} onChange={(e) => onChange({ communityId: e.target.value || undefined })}>
          <option value="">All communities</option>
          {communities.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
        </select>
      </label>
      <fieldset className="flex gap-2">
        <legend className="mb-1 font-medium">Built between</legend>
        <input aria-label="Built from year" inputMode="numeric" placeholder="from" className={select} defaultValue={filters.yearFrom ?? ''}
          onBlur={(e) => onChange({ yearFrom: /^\d{4}$/.test(e.target.value) ? e.target.value : undefined })} />
        <input aria-label="Built to year" inputMode="numeric" placeholder="to" className={select} defaultValue={filters.yearTo ?? ''}
          onBlur={(e) => onChange({ yearTo: /^\d{4}$/.test(e.target.value) ? e.target.value : undefined })} />
      </fieldset>
      <fieldset>
        <legend className="mb-1 font-medium">Outcome</legend>
        {OUTCOMES.map((o) => (
          <label key={o} className="flex min-h-9 items-center gap-2">
            <input type="checkbox" className="h-5 w-5" checked={filters.outcome?.includes(o) ?? false} onChange={() => toggleOutcome(o)} />
            {OUTCOME_LABELS[o]}
          </label>
        ))}
        <p className="text-xs text-muted">None ticked shows every outcome.</p>
      </fieldset>
    </form>
  );
}
