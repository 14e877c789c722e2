// Sampling plan: how many homes to sample in a community and which ones, spread across it
// rather than clustered on one street (PRODUCT.md computation 7).

import { distance } from '@turf/turf';
import { cochranSampleSize } from './statistics';

export interface SamplingHome {
  id: string;
  lon: number;
  lat: number;
  doNotContact: boolean;
  street?: string;
}

/** Two candidates closer than this in their distance to the sample count as tied (metres). */
const TIE_TOLERANCE_M = 1;

/**
 * Picks `count` homes spread across the community by deterministic farthest-point sampling
 * (Gonzalez 1985, the greedy 2-approximation to the k-centre problem): start at `seedId`
 * (if eligible) or the home nearest the centroid, then repeatedly add the home farthest
 * (great-circle distance, turf.distance) from every home already chosen. Near-ties go to
 * the street with fewer chosen homes, then to the smaller id, so the same input always
 * gives the same plan. Do-not-contact homes are never chosen. Returns ids in pick order;
 * all eligible homes when `count` is at least their number.
 */
export function planSample(input: { homes: readonly SamplingHome[]; count: number; seedId?: string }): string[] {
  const { count, seedId } = input;
  if (!Number.isInteger(count) || count < 0) throw new RangeError('count must be a whole number ≥ 0');
  const seen = new Set<string>();
  const eligible = input.homes
    .filter((h) => !h.doNotContact && Number.isFinite(h.lon) && Number.isFinite(h.lat))
    .filter((h) => (seen.has(h.id) ? false : (seen.add(h.id), true)))
    .sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  if (count === 0 || eligible.length === 0) return [];

  const start = seedId ? eligible.find((h) => h.id === seedId) : undefined;
  const centroid: [number, number] = [
    eligible.reduce((s, h) => s + h.lon, 0) / eligible.length,
    eligible.reduce((s, h) => s + h.lat, 0) / eligible.length,
  ];
  let first = start ?? eligible[0];
  if (!start) {
    let best = Infinity;
    for (const home of eligible) {
      const d = distance(centroid, [home.lon, home.lat], { units: 'meters' });
      if (d < best - 1e-9) {
        best = d;
        first = home;
      }
    }
  }

  const chosen: SamplingHome[] = [first];
  const chosenIds = new Set([first.id]);
  const streetCounts = new Map<string, number>();
  const countStreet = (home: SamplingHome) => {
    if (home.street) streetCounts.set(home.street, (streetCounts.get(home.street) ?? 0) + 1);
  };
  countStreet(first);
  // Distance from each eligible home to its nearest chosen home, updated after each pick.
  const nearestM = eligible.map((h) => distance([first.lon, first.lat], [h.lon, h.lat], { units: 'meters' }));

  while (chosen.length < Math.min(count, eligible.length)) {
    let bestIndex = -1;
    for (let i = 0; i < eligible.length; i += 1) {
      if (chosenIds.has(eligible[i].id)) continue;
      if (bestIndex === -1) {
        bestIndex = i;
        continue;
      }
      const gap = nearestM[i] - nearestM[bestIndex];
      if (gap > TIE_TOLERANCE_M) bestIndex = i;
      else if (gap >= -TIE_TOLERANCE_M) {
        const streetI = streetCounts.get(eligible[i].street ?? '') ?? 0;
        const streetBest = streetCounts.get(eligible[bestIndex].street ?? '') ?? 0;
        // Eligible is sorted by id, so keeping the earlier index on a full tie picks the smaller id.
        if (streetI < streetBest) bestIndex = i;
      }
    }
    const pick = eligible[bestIndex];
    chosen.push(pick);
    chosenIds.add(pick.id);
    countStreet(pick);
    for (let i = 0; i < eligible.length; i += 1) {
      const d = distance([pick.lon, pick.lat], [eligible[i].lon, eligible[i].lat], { units: 'meters' });
      if (d < nearestM[i]) nearestM[i] = d;
    }
  }
  return chosen.map((h) => h.id);
}

/**
 * Homes to sample in a community of `homesTotal` for a given margin of error on the failure
 * rate: Cochran's n₀ with the finite-population correction, rounded up (Cochran, Sampling
 * Techniques, 1977, §4.4). `expectedRate` defaults to 0.5, the most conservative choice;
 * a builder's known failure rate (e.g. about 1 in 5 passive homes, Minnesota Dept. of Health)
 * gives a smaller sample.
 */
export function sampleSizeForCommunity(input: {
  homesTotal: number;
  marginOfError: number;
  expectedRate?: number;
  confidence?: number;
}): number {
  const { homesTotal, marginOfError, expectedRate = 0.5, confidence = 0.95 } = input;
  return cochranSampleSize({ marginOfError, expectedRate, confidence, populationSize: homesTotal });
}
