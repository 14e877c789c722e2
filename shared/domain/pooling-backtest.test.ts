import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import stdlibBetaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import seedrandom from 'seedrandom';
import { backtestPooling, betaQuantileFast, hypergeometricPmf, pooledEstimates, priorFromRest, type PoolingGroup } from './pooling-backtest';
import { betaQuantile, empiricalBayesShrinkage } from './statistics';

/** Every way of choosing `size` items from 0..n−1 (brute force, for small n only). */
function subsets(n: number, size: number): number[][] {
  if (size === 0) return [[]];
  if (n < size) return [];
  return [...subsets(n - 1, size - 1).map((s) => [...s, n - 1]), ...subsets(n - 1, size)];
}

describe('hypergeometricPmf', () => {
  it('matches C(k, j) C(n − k, s − j) / C(n, s) computed with jstat’s combination', () => {
    for (const [n, k, s] of [[10, 3, 2], [40, 12, 5], [120, 30, 8]]) {
      let total = 0;
      for (let j = 0; j <= s; j += 1) {
        const expected = (jStat.combination(k, j) * jStat.combination(n - k, s - j)) / jStat.combination(n, s);
        expect(hypergeometricPmf(j, n, k, s)).toBeCloseTo(expected, 12);
        total += hypergeometricPmf(j, n, k, s);
      }
      expect(total).toBeCloseTo(1, 12);
    }
  });
});

describe('priorFromRest', () => {
  const groups: PoolingGroup[] = [
    { key: 'a', parentKey: 'b1', k: 3, n: 10 },
    { key: 'b', parentKey: 'b1', k: 5, n: 12 },
    { key: 'c', parentKey: 'b1', k: 1, n: 2 },
    { key: 'd', parentKey: 'b2', k: 0, n: 8 },
  ];

  it('never uses the held-out group: its own homes cannot move its prior', () => {
    const before = priorFromRest(groups, 'c', 'b1');
    const changed = groups.map((g) => (g.key === 'c' ? { ...g, k: 2 } : g));
    expect(priorFromRest(changed, 'c', 'b1')).toEqual(before);
    // …and it is the moment fit over the builder's other communities only (a and b, not d).
    const direct = empiricalBayesShrinkage([{ key: 'a', k: 3, n: 10 }, { key: 'b', k: 5, n: 12 }]).prior;
    expect(before.prior.alpha).toBeCloseTo(direct.alpha, 9);
    expect(before.prior.beta).toBeCloseTo(direct.beta, 9);
    expect(before).toMatchObject({ source: 'same_parent', groupsUsed: 2, homesUsed: 22 });
  });

  it('borrows from every other builder when the builder has no other community, and is uniform with nothing else', () => {
    expect(priorFromRest(groups, 'd', 'b2')).toMatchObject({ source: 'all_groups', groupsUsed: 3 });
    expect(priorFromRest([{ key: 'x', parentKey: 'p', k: 1, n: 3 }], 'x', 'p')).toMatchObject({ source: 'uniform', prior: { alpha: 1, beta: 1 } });
  });
});

describe('leave-one-out prior from sufficient statistics', () => {
  it('equals empiricalBayesShrinkage refitted on the other groups, for many random builders', () => {
    const random = seedrandom('pooling-check');
    for (let trial = 0; trial < 200; trial += 1) {
      const groups: PoolingGroup[] = Array.from({ length: 2 + Math.floor(random() * 6) }, (_, i) => {
        const n = Math.floor(random() * 15);
        return { key: `g${i}`, parentKey: 'b', n, k: Math.floor(random() * (n + 1)) };
      });
      const held = groups[0];
      const others = groups.slice(1).filter((g) => g.n > 0);
      const rest = priorFromRest(groups, held.key, 'b');
      if (others.length === 0) continue;
      const direct = empiricalBayesShrinkage(others).prior;
      expect(rest.prior.alpha).toBeCloseTo(direct.alpha, 8);
      expect(rest.prior.beta).toBeCloseTo(direct.beta, 8);
    }
  });
});

describe('betaQuantileFast', () => {
  it('agrees with the bisection quantile and with @stdlib to 1e-9', () => {
    for (const [a, b] of [[1, 1], [3, 9], [0.5, 0.5], [0.6, 40], [25.3, 80.1], [200, 3]]) {
      for (const p of [0.025, 0.5, 0.975]) {
        expect(betaQuantileFast(p, a, b)).toBeCloseTo(betaQuantile(p, a, b), 9);
        expect(betaQuantileFast(p, a, b)).toBeCloseTo(stdlibBetaQuantile(p, a, b), 9);
      }
    }
  });
});

describe('pooledEstimates', () => {
  it('pulls a two-home community towards the builder, and keeps a large one close to its own rate', () => {
    const groups: PoolingGroup[] = [
      { key: 'big', parentKey: 'b', k: 20, n: 100 },
      { key: 'mid', parentKey: 'b', k: 12, n: 60 },
      { key: 'two', parentKey: 'b', k: 2, n: 2 },
    ];
    const [big, , two] = pooledEstimates(groups);
    expect(two.rawRate).toBe(1);
    expect(two.pooledRate).toBeLessThan(0.5);
    expect(two.lower).toBeLessThan(two.pooledRate);
    expect(two.upper).toBeGreaterThan(two.pooledRate);
    expect(Math.abs(big.pooledRate - 0.2)).toBeLessThan(0.02);
  });
});

describe('backtestPooling (leave one community out)', () => {
  it('scores raw and pooled predictions as the exact average over every set of homes seen first', () => {
    const groups: PoolingGroup[] = [
      { key: 'held', parentKey: 'b', k: 2, n: 6 },
      { key: 'o1', parentKey: 'b', k: 3, n: 9 },
      { key: 'o2', parentKey: 'b', k: 1, n: 7 },
    ];
    const result = backtestPooling(groups, { seen: 2 });
    const row = result.rows.find((r) => r.key === 'held')!;
    const { alpha, beta } = priorFromRest(groups, 'held', 'b').prior;
    // Brute force: label homes 0..5, the first two fail; enumerate all 15 pairs seen first.
    const pairs = subsets(6, 2);
    expect(pairs).toHaveLength(15);
    let raw = 0;
    let pooled = 0;
    for (const pair of pairs) {
      const j = pair.filter((h) => h < 2).length;
      raw += Math.abs(j / 2 - 2 / 6) / pairs.length;
      pooled += Math.abs((alpha + j) / (alpha + beta + 2) - 2 / 6) / pairs.length;
    }
    expect(row.errorRaw).toBeCloseTo(raw, 12);
    expect(row.errorPooled).toBeCloseTo(pooled, 12);
    expect(row.errorRestOnly).toBeCloseTo(Math.abs(alpha / (alpha + beta) - 2 / 6), 12);
  });

  it('beats the raw rate of two homes when communities of a builder behave alike', () => {
    const groups: PoolingGroup[] = ['a', 'b', 'c', 'd', 'e', 'f'].map((key, i) => ({ key, parentKey: 'builder', k: 6 + (i % 2), n: 24 }));
    const result = backtestPooling(groups, { seen: 2 });
    expect(result.groupsScored).toBe(6);
    expect(result.meanErrorPooled!).toBeLessThan(result.meanErrorRaw! / 2);
  });

  it('skips groups with no more homes than are seen, and reports null with nothing to score', () => {
    const result = backtestPooling([{ key: 'a', parentKey: 'b', k: 1, n: 2 }], { seen: 2 });
    expect(result).toMatchObject({ groupsScored: 0, meanErrorRaw: null, meanErrorPooled: null });
    expect(() => backtestPooling([], { seen: 0 })).toThrow(RangeError);
  });
});
