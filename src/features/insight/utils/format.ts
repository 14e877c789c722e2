import { formatRadon, paToInWc, type RadonDisplayUnit } from '@shared/domain/units';

export const percent = (x: number | null | undefined, digits = 0) => (x == null ? '—' : `${(x * 100).toFixed(digits)} %`);
export const interval = (lower: number, upper: number) => `${Math.round(lower * 100)}–${Math.round(upper * 100)} %`;
export const inWc = (pa: number | null) => (pa == null ? '—' : `${paToInWc(pa).toFixed(2)} in. WC`);
export const radon = (bqM3: number | null, unit: RadonDisplayUnit) => (bqM3 == null ? '—' : formatRadon(bqM3, unit));

export const REWORK_LABELS: Record<string, string> = {
  added_suction_point: 'added suction point',
  sealed_opening: 'sealed opening',
  sealed_joint: 'sealed slab joint',
  rerouted_pipe: 're-routed pipe',
  larger_fan: 'larger fan',
  other: 'other',
};

/** The map, filtered to one builder's homes of one construction year in one community. */
export function mapLinkFor(row: { builderId: string | null; communityId: string | null; yearBuilt: number | null }): string {
  const q = new URLSearchParams();
  if (row.builderId) q.set('builderId', row.builderId);
  if (row.yearBuilt != null) {
    q.set('yearFrom', String(row.yearBuilt));
    q.set('yearTo', String(row.yearBuilt));
  }
  if (row.communityId) q.set('communityId', row.communityId);
  return `/?${q}`;
}
