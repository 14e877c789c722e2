import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import type { ComparisonRow } from '@shared/schemas/insight';
import type { RadonDisplayUnit } from '@shared/domain/units';
import { inWc, interval, mapLinkFor, percent, radon, REWORK_LABELS } from '../utils/format';

type Key = 'builder' | 'community' | 'year' | 'homes' | 'sampled' | 'failures' | 'rate' | 'pooled' | 'vacuum' | 'post';

const COLUMNS: { key: Key; label: string; numeric?: boolean; value(r: ComparisonRow): string | number | null }[] = [
  { key: 'builder', label: 'Builder', value: (r) => r.builderName },
  { key: 'community', label: 'Community', value: (r) => r.communityName },
  { key: 'year', label: 'Built', numeric: true, value: (r) => r.yearBuilt },
  { key: 'homes', label: 'Homes', numeric: true, value: (r) => r.homes },
  { key: 'sampled', label: 'Sampled', numeric: true, value: (r) => r.sampled },
  { key: 'failures', label: 'Failures', numeric: true, value: (r) => r.failures },
  { key: 'rate', label: 'Failure rate (95 % interval)', numeric: true, value: (r) => r.wilson.rate },
  { key: 'pooled', label: 'Pooled', numeric: true, value: (r) => r.pooled.rate },
  { key: 'vacuum', label: 'Median vacuum', numeric: true, value: (r) => r.medianVacuumPa },
  { key: 'post', label: 'Median post-test', numeric: true, value: (r) => r.medianPostBqM3 },
];

function compare(a: string | number | null, b: string | number | null): number {
  // Empty values sort last whichever way the column is sorted.
  if (a === null || b === null) return a === b ? 0 : a === null ? 1 : -1;
  return typeof a === 'number' && typeof b === 'number' ? a - b : String(a).localeCompare(String(b));
}

/** Sortable table with sticky headers; each construction year links to those homes on the map. */
export function ComparisonTable({ rows, radonUnit }: { rows: ComparisonRow[]; radonUnit: RadonDisplayUnit }) {
  const [sort, setSort] = useState<{ key: Key; dir: 1 | -1 }>({ key: 'builder', dir: 1 });
  const sorted = useMemo(() => {
    const column = COLUMNS.find((c) => c.key === sort.key)!;
    return [...rows].sort((a, b) => {
      const va = column.value(a);
      const vb = column.value(b);
      if (va === null || vb === null) return compare(va, vb);
      return sort.dir * compare(va, vb);
    });
  }, [rows, sort]);

  return (
    <div className="max-h-[70vh] overflow-auto rounded-md border border-rule bg-panel">
      <table className="data w-full text-left text-sm">
        <thead>
          <tr className="border-b border-rule">
            {COLUMNS.map((c) => (
              <th key={c.key} scope="col" className={`z-10 p-0 ${c.numeric ? 'text-right' : ''}`} aria-sort={sort.key === c.key ? (sort.dir === 1 ? 'ascending' : 'descending') : 'none'}>
                <button
                  className={`flex min-h-11 w-full items-center gap-1 px-2 font-medium ${c.numeric ? 'justify-end' : ''}`}
                  onClick={() => setSort((s) => ({ key: c.key, dir: s.key === c.key ? (s.dir === 1 ? -1 : 1) : 1 }))}
                >
                  {c.label}
                  <span aria-hidden className="text-muted">{sort.key === c.key ? (sort.dir === 1 ? '▲' : '▼') : '↕'}</span>
                </button>
              </th>
            ))}
            <th scope="col" className="z-10 px-2 font-medium">Common rework</th>
          </tr>
        </thead>
        <tbody className="tabular">
          {sorted.map((r) => (
            <tr key={`${r.builderId}|${r.communityId}|${r.yearBuilt}`} className="border-b border-rule/60 align-top">
              <td className="p-2">{r.builderName ?? '—'}</td>
              <td className="p-2">{r.communityName ?? 'No community'}</td>
              <td className="p-2 text-right">
                <Link
                  to={mapLinkFor(r)}
                  className="text-accent underline"
                  aria-label={`Show ${r.builderName ?? 'these'} homes built in ${r.yearBuilt ?? 'unknown year'}${r.communityName ? ` in ${r.communityName}` : ''} on the map`}
                >
                  {r.yearBuilt ?? '—'}
                </Link>
              </td>
              <td className="p-2 text-right">{r.homes}</td>
              <td className="p-2 text-right">{r.sampled}</td>
              <td className="p-2 text-right">{r.failures}</td>
              <td className="p-2 text-right whitespace-nowrap">
                {r.sampled === 0 ? <span className="text-muted">not sampled</span> : <>{percent(r.wilson.rate)} <span className="text-muted">({interval(r.wilson.lower, r.wilson.upper)})</span></>}
              </td>
              <td className="p-2 text-right whitespace-nowrap">{percent(r.pooled.rate)}</td>
              <td className="p-2 text-right whitespace-nowrap">{inWc(r.medianVacuumPa)}</td>
              <td className="p-2 text-right whitespace-nowrap">{radon(r.medianPostBqM3, radonUnit)}</td>
              <td className="p-2 text-muted">{r.topReworkReasons.map((x) => `${REWORK_LABELS[x.reason] ?? x.reason} (${x.count})`).join(', ') || '—'}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
