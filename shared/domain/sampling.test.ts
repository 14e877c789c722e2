import { describe, expect, it } from 'vitest';
import { distance } from '@turf/turf';
import * as geographiclib from 'geographiclib-geodesic';
import { planSample, sampleSizeForCommunity, type SamplingHome } from './sampling';

// Two invented clusters of 25 homes each (5 × 5 grids ~20 m apart), about 4.5 km apart.
function grid(prefix: string, lon0: number, lat0: number, street: (row: number) => string): SamplingHome[] {
  const homes: SamplingHome[] = [];
  for (let row = 0; row < 5; row += 1) {
    for (let col = 0; col < 5; col += 1) {
      homes.push({
        id: `${prefix}-${row}-${col}`,
        lon: lon0 + col * 0.00025,
        lat: lat0 + row * 0.00018,
        doNotContact: false,
        street: street(row),
      });
    }
  }
  return homes;
}
const west = grid('w', -75.05, 40.0, (row) => `West Row ${row}`);
const east = grid('e', -75.0, 40.01, (row) => `East Row ${row}`);
const community = [...west, ...east];

describe('planSample', () => {
  it('covers both clusters of a community', () => {
    const picked = planSample({ homes: community, count: 4 });
    expect(picked).toHaveLength(4);
    expect(picked.some((id) => id.startsWith('w-'))).toBe(true);
    expect(picked.some((id) => id.startsWith('e-'))).toBe(true);
  });

  it('spreads picks across streets instead of one street', () => {
    const picked = planSample({ homes: west, count: 5 });
    const rows = new Set(picked.map((id) => id.split('-')[1]));
    expect(rows.size).toBeGreaterThanOrEqual(3);
  });

  it('never picks a do-not-contact home', () => {
    const homes = community.map((h, i) => ({ ...h, doNotContact: i % 3 === 0 }));
    const blocked = new Set(homes.filter((h) => h.doNotContact).map((h) => h.id));
    const picked = planSample({ homes, count: 20 });
    expect(picked.filter((id) => blocked.has(id))).toEqual([]);
  });

  it('gives the same plan for the same homes in any order', () => {
    const shuffled = [...community].reverse();
    expect(planSample({ homes: shuffled, count: 8 })).toEqual(planSample({ homes: community, count: 8 }));
  });

  it('starts from the requested seed home', () => {
    expect(planSample({ homes: community, count: 3, seedId: 'e-4-4' })[0]).toBe('e-4-4');
  });

  it('returns every eligible home when asked for more than there are', () => {
    const homes = west.slice(0, 6).map((h, i) => ({ ...h, doNotContact: i === 0 }));
    const picked = planSample({ homes, count: 50 });
    expect(picked).toHaveLength(5);
    expect(new Set(picked)).toEqual(new Set(homes.slice(1).map((h) => h.id)));
  });

  it('returns nothing for a count of zero', () => {
    expect(planSample({ homes: community, count: 0 })).toEqual([]);
  });
});

describe('distance on the ellipsoid', () => {
  it('uses a turf.distance within 0.5 % of GeographicLib', () => {
    // GeographicLib (npm geographiclib-geodesic 2.2, Karney 2013): (40.6, −73.8) → (51.6, −0.5)
    // = 5,551,759.400 m on WGS84 (PRODUCT.md check table). turf.distance uses a sphere
    // (haversine, R = 6,371,008.8 m), so it agrees to about 0.3 % here.
    const reference = geographiclib.Geodesic.WGS84.Inverse(40.6, -73.8, 51.6, -0.5).s12 ?? Number.NaN;
    expect(reference).toBeCloseTo(5_551_759.4, 2);
    const turfM = distance([-73.8, 40.6], [-0.5, 51.6], { units: 'meters' });
    expect(Math.abs(turfM / reference - 1)).toBeLessThan(0.005);
  });
});

describe('sampleSizeForCommunity', () => {
  it('wraps Cochran with the finite-population correction', () => {
    // Cochran, Sampling Techniques (1977) §4.4 — formula from memory, values computed:
    // ±5 points at 95 %, N = 200 → 132 (PRODUCT.md check table).
    expect(sampleSizeForCommunity({ homesTotal: 200, marginOfError: 0.05 })).toBe(132);
  });

  it('needs fewer homes when the builder’s failure rate is known to be near 1 in 5', () => {
    // Cochran §4.4: p = 0.2 → n₀ = 1.959964² · 0.16 / 0.1² = 61.46; N = 120 → 61.46 / (1 + 60.46/120) = 40.9 → 41.
    // (1 in 5: Minnesota Dept. of Health passive-system study, PRODUCT.md — secondary.)
    expect(sampleSizeForCommunity({ homesTotal: 120, marginOfError: 0.1, expectedRate: 0.2 })).toBe(41);
    expect(sampleSizeForCommunity({ homesTotal: 120, marginOfError: 0.1 })).toBeGreaterThan(41);
  });
});
