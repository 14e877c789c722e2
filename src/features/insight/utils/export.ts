import type { ComparisonRow } from '@shared/schemas/insight';
import { bqM3ToPciL, paToInWc, type RadonDisplayUnit } from '@shared/domain/units';
import { toSafeCsv } from './csv';

const round = (x: number | null, digits: number) => (x == null ? null : Number(x.toFixed(digits)));

/** The comparison table as formula-safe CSV; units are in the column names, rates as percentages. */
export function comparisonCsv(rows: ComparisonRow[], radonUnit: RadonDisplayUnit): string {
  const post = radonUnit === 'pCi/L' ? 'median post-test (pCi/L)' : 'median post-test (Bq/m3)';
  return toSafeCsv(
    ['builder', 'community', 'year built', 'homes', 'sampled', 'failures', 'failure rate (%)', 'Wilson 95% lower (%)', 'Wilson 95% upper (%)', 'pooled rate (%)', 'median vacuum (in. WC)', post, 'common rework'],
    rows.map((r) => [
      r.builderName,
      r.communityName,
      r.yearBuilt,
      r.homes,
      r.sampled,
      r.failures,
      r.wilson.rate == null ? null : round(r.wilson.rate * 100, 1),
      round(r.wilson.lower * 100, 1),
      round(r.wilson.upper * 100, 1),
      r.pooled.rate == null ? null : round(r.pooled.rate * 100, 1),
      r.medianVacuumPa == null ? null : round(paToInWc(r.medianVacuumPa), 2),
      r.medianPostBqM3 == null ? null : round(radonUnit === 'pCi/L' ? bqM3ToPciL(r.medianPostBqM3) : r.medianPostBqM3, 1),
      r.topReworkReasons.map((x) => `${x.reason} (${x.count})`).join('; '),
    ]),
  );
}
