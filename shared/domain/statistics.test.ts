import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import stdlibBetaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import {
  betaBinomialPredictive,
  betaQuantile,
  clopperPearsonInterval,
  cochranInitialSampleSize,
  cochranSampleSize,
  empiricalBayesShrinkage,
  logGamma,
  median,
  normalQuantile,
  posteriorBeta,
  regularizedIncompleteBeta,
  wilsonInterval,
} from './statistics';

const round4 = (x: number) => Math.round(x * 1e4) / 1e4;

describe('special functions', () => {
  it('gives z = 1.959964 for 97.5 % and 1.644854 for 95 %', () => {
    // Standard normal tables (e.g. Abramowitz & Stegun Table 26.5); cross-check jstat.normal.inv.
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 12);
    expect(normalQuantile(0.95)).toBeCloseTo(1.6448536269514722, 12);
    for (const p of [1e-10, 0.001, 0.2, 0.5, 0.7, 0.999]) {
      expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 6);
    }
  });

  it('matches ln Γ at known points and jstat elsewhere', () => {
    // Γ(5) = 24, Γ(½) = √π (definition of the gamma function); jstat.gammaln cross-check.
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 12);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 12);
    for (const x of [0.1, 3.7, 52, 1234.5]) expect(logGamma(x)).toBeCloseTo(jStat.gammaln(x), 8);
  });

  it('matches jstat for the regularised incomplete beta', () => {
    // npm jstat 1.9 ibeta (library cross-check); jstat's own continued fraction is good to
    // about 1e-9, hence 8 decimals.
    for (const [x, a, b] of [[0.3, 3, 9], [0.8, 0.5, 0.5], [0.05, 81, 183], [0.99, 200, 3]]) {
      expect(regularizedIncompleteBeta(x, a, b)).toBeCloseTo(jStat.ibeta(x, a, b), 8);
    }
  });

  it('matches 30-digit reference values of the regularised incomplete beta', () => {
    // Python mpmath 30-digit betainc(a, b, 0, x, regularized=True), computed once for this test.
    expect(regularizedIncompleteBeta(0.3, 3, 9)).toBeCloseTo(0.687259545749999971, 12);
    expect(regularizedIncompleteBeta(0.8, 0.5, 0.5)).toBeCloseTo(0.704832764699133487, 12);
    expect(regularizedIncompleteBeta(0.99, 200, 3)).toBeCloseTo(0.671238171038388890, 12);
  });

  it('matches @stdlib for Beta quantiles of a posterior', () => {
    // npm @stdlib/stats-base-dists-beta-quantile 0.2.3 (library cross-check): posterior
    // Beta(3, 9) from a Beta(1, 1) prior with 2 failures in 10.
    for (const p of [0.025, 0.05, 0.5, 0.9, 0.975]) {
      expect(betaQuantile(p, 3, 9)).toBeCloseTo(stdlibBetaQuantile(p, 3, 9), 10);
    }
  });
});

describe('wilsonInterval (Newcombe 1998, Statistics in Medicine 17:857, Table I, method 3)', () => {
  it('gives 0.2553–0.3662 for 81/263', () => {
    // Newcombe (1998) Table I.
    const { rate, lower, upper } = wilsonInterval(81, 263);
    expect(rate).toBeCloseTo(81 / 263, 12);
    expect([round4(lower), round4(upper)]).toEqual([0.2553, 0.3662]);
  });

  it('gives 0.0624–0.1605 for 15/148', () => {
    // Newcombe (1998) Table I.
    const { lower, upper } = wilsonInterval(15, 148);
    expect([round4(lower), round4(upper)]).toEqual([0.0624, 0.1605]);
  });

  it('gives 0–0.1611 for 0/20', () => {
    // Newcombe (1998) Table I.
    const { lower, upper } = wilsonInterval(0, 20);
    expect([lower, round4(upper)]).toEqual([0, 0.1611]);
  });

  it('gives 0.0061–0.1718 for 1/29', () => {
    // Newcombe (1998) Table I.
    const { lower, upper } = wilsonInterval(1, 29);
    expect([round4(lower), round4(upper)]).toEqual([0.0061, 0.1718]);
  });

  it('shows total uncertainty when nothing was sampled', () => {
    const result = wilsonInterval(0, 0);
    expect(Number.isNaN(result.rate)).toBe(true);
    expect([result.lower, result.upper]).toEqual([0, 1]);
  });

  it('rejects impossible counts', () => {
    expect(() => wilsonInterval(5, 3)).toThrow(RangeError);
    expect(() => wilsonInterval(1.5, 3)).toThrow(RangeError);
  });
});

describe('clopperPearsonInterval (Newcombe 1998 Table I, method 5)', () => {
  it('gives 0.2527–0.3676 for 81/263, as jstat.beta.inv does', () => {
    // Newcombe (1998) Table I; npm jstat 1.9 beta.inv cross-check.
    const { lower, upper } = clopperPearsonInterval(81, 263);
    expect([round4(lower), round4(upper)]).toEqual([0.2527, 0.3676]);
    expect(lower).toBeCloseTo(jStat.beta.inv(0.025, 81, 183), 8);
    expect(upper).toBeCloseTo(jStat.beta.inv(0.975, 82, 182), 8);
  });

  it('gives 0–0.1684 for 0/20, i.e. 1 − 0.025^(1/20)', () => {
    // Newcombe (1998) Table I; closed form for k = 0 (Clopper & Pearson 1934); jstat cross-check.
    const { lower, upper } = clopperPearsonInterval(0, 20);
    expect(lower).toBe(0);
    expect(round4(upper)).toBe(0.1684);
    expect(upper).toBeCloseTo(1 - 0.025 ** (1 / 20), 10);
    expect(upper).toBeCloseTo(jStat.beta.inv(0.975, 1, 20), 8);
  });

  it('is wider than Wilson for the same counts', () => {
    // Newcombe (1998): Clopper–Pearson is conservative (Table I: 0.2527–0.3676 ⊃ 0.2553–0.3662).
    const cp = clopperPearsonInterval(15, 148);
    const w = wilsonInterval(15, 148);
    expect(cp.upper - cp.lower).toBeGreaterThan(w.upper - w.lower);
  });
});

describe('median', () => {
  it('takes the middle value, or the mean of the middle two', () => {
    // Definition of the sample median.
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
  });

  it('is null for no values', () => {
    expect(median([])).toBeNull();
  });
});

describe('Cochran sample size (Sampling Techniques, 3rd ed., 1977, §4.4 — formula from memory, values computed)', () => {
  it('gives n₀ = 384.16 for z = 1.96, p = 0.5, d = 0.05', () => {
    // Cochran §4.4: 1.96² × 0.25 / 0.05² = 384.16.
    expect(cochranInitialSampleSize({ marginOfError: 0.05, z: 1.96 })).toBeCloseTo(384.16, 10);
    // With the unrounded z = 1.959964 (95 %) the value is 384.146.
    expect(cochranInitialSampleSize({ marginOfError: 0.05 })).toBeCloseTo(384.146, 3);
  });

  it('applies the finite-population correction: N = 50, 100, 200, 1000 → 45, 80, 132, 278', () => {
    // Cochran §4.4: n = n₀ / (1 + (n₀ − 1)/N), rounded up; PRODUCT.md check table.
    const sizes = [50, 100, 200, 1000].map((populationSize) =>
      cochranSampleSize({ marginOfError: 0.05, z: 1.96, populationSize }),
    );
    expect(sizes).toEqual([45, 80, 132, 278]);
    const sizesFromConfidence = [50, 100, 200, 1000].map((populationSize) =>
      cochranSampleSize({ marginOfError: 0.05, confidence: 0.95, populationSize }),
    );
    expect(sizesFromConfidence).toEqual([45, 80, 132, 278]);
  });

  it('needs fewer homes at a wider margin and never more than the community', () => {
    // Cochran §4.4 formula: d = 0.15, N = 40 → 384.146·(0.05/0.15)² = 42.68 → 42.68/(1 + 41.68/40) = 20.9 → 21.
    expect(cochranSampleSize({ marginOfError: 0.15, populationSize: 40 })).toBe(21);
    expect(cochranSampleSize({ marginOfError: 0.01, populationSize: 12 })).toBeLessThanOrEqual(12);
  });
});

describe('beta-binomial predictive', () => {
  it('updates a Beta(1, 1) prior with 2 failures in 10 to Beta(3, 9)', () => {
    // Conjugate update (Gelman et al., Bayesian Data Analysis 3rd ed. §2.4).
    expect(posteriorBeta({ alpha: 1, beta: 1 }, 2, 10)).toEqual({ alpha: 3, beta: 9 });
  });

  it('predicts mean 10.0, variance 30.0, P(0) = 0.00792 for 40 unsampled homes', () => {
    // PRODUCT.md check table (computed): Beta(3, 9), m = 40 → mean 40·3/12 = 10,
    // variance 40·3·9·52/(144·13) = 30, P(0) = B(3, 49)/B(3, 9) = 990/124950 = 0.007923.
    const predictive = betaBinomialPredictive({ alpha: 3, beta: 9, m: 40 });
    expect(predictive.mean).toBeCloseTo(10, 12);
    expect(predictive.variance).toBeCloseTo(30, 12);
    expect(predictive.pmf(0)).toBeCloseTo(0.00792, 5);
    expect(predictive.pmf(0)).toBeCloseTo(990 / 124_950, 12);
  });

  it('agrees with jstat’s beta function for every outcome', () => {
    // npm jstat 1.9: C(m, j) · betafn(j + α, m − j + β) / betafn(α, β).
    const predictive = betaBinomialPredictive({ alpha: 3, beta: 9, m: 40 });
    for (let j = 0; j <= 40; j += 1) {
      const reference = (jStat.combination(40, j) * jStat.betafn(j + 3, 40 - j + 9)) / jStat.betafn(3, 9);
      expect(predictive.pmf(j)).toBeCloseTo(reference, 10);
    }
  });

  it('agrees with integrating binomial × Beta density numerically (jstat pdfs)', () => {
    // Composite Simpson's rule over p ∈ [0, 1] with jstat.binomial.pdf × jstat.beta.pdf.
    const steps = 2000;
    const integrand = (p: number, j: number) => jStat.binomial.pdf(j, 40, p) * jStat.beta.pdf(p, 3, 9);
    const simpson = (j: number) => {
      let sum = integrand(0, j) + integrand(1, j);
      for (let i = 1; i < steps; i += 1) sum += (i % 2 === 1 ? 4 : 2) * integrand(i / steps, j);
      return (sum / (3 * steps));
    };
    const predictive = betaBinomialPredictive({ alpha: 3, beta: 9, m: 40 });
    for (const j of [0, 5, 10, 20]) expect(predictive.pmf(j)).toBeCloseTo(simpson(j), 8);
  });

  it('has a CDF reaching 1 and a quantile that inverts it', () => {
    // Definition of the quantile of a discrete distribution (smallest j with F(j) ≥ p).
    const predictive = betaBinomialPredictive({ alpha: 3, beta: 9, m: 40 });
    expect(predictive.cdf(40)).toBe(1);
    const q90 = predictive.quantile(0.9);
    expect(predictive.cdf(q90)).toBeGreaterThanOrEqual(0.9);
    expect(predictive.cdf(q90 - 1)).toBeLessThan(0.9);
    expect(predictive.quantile(0)).toBe(0);
    expect(predictive.quantile(1)).toBeLessThanOrEqual(40);
  });

  it('is uniform on 0…m under a Beta(1, 1) prior with no data', () => {
    // Known result: BetaBin(m, 1, 1) is discrete uniform; variance m(m + 2)/12.
    const predictive = betaBinomialPredictive({ alpha: 1, beta: 1, m: 10 });
    for (let j = 0; j <= 10; j += 1) expect(predictive.pmf(j)).toBeCloseTo(1 / 11, 12);
    expect(predictive.variance).toBeCloseTo((10 * 12) / 12, 12);
  });
});

describe('empiricalBayesShrinkage (Efron & Morris 1975; Casella 1985)', () => {
  it('pulls each group towards the pooled rate without reordering them', () => {
    // Property of empirical-Bayes posterior means (Casella 1985): each lies between the raw
    // rate and the pooled rate, and the ranking is preserved.
    const result = empiricalBayesShrinkage([
      { key: 'a', k: 1, n: 12 },
      { key: 'b', k: 6, n: 10 },
      { key: 'c', k: 3, n: 8 },
    ]);
    expect(result.pooledRate).toBeCloseTo(10 / 30, 12);
    for (const g of result.groups) {
      const raw = g.rawRate ?? 0;
      expect(g.shrunkRate).toBeGreaterThanOrEqual(Math.min(raw, result.pooledRate));
      expect(g.shrunkRate).toBeLessThanOrEqual(Math.max(raw, result.pooledRate));
      expect(g.lower).toBeLessThan(g.shrunkRate);
      expect(g.upper).toBeGreaterThan(g.shrunkRate);
    }
    const [a, b, c] = result.groups.map((g) => g.shrunkRate);
    expect(a).toBeLessThan(c);
    expect(c).toBeLessThan(b);
  });

  it('fits the prior strength by the method of moments', () => {
    // Hand computation of the Kleinman (1973) moment estimator (from memory): groups 2/10 and
    // 8/10, μ = 0.5, S = 10·0.3² + 10·0.3² = 1.8, G′ = 1 → ρ = (1.8/0.25 − 1)/(20 − 1) = 6.2/19,
    // α + β = 19/6.2 − 1 = 2.0645; shrunk rate of the first group (2 + 1.0323)/(10 + 2.0645).
    const result = empiricalBayesShrinkage([
      { key: 'x', k: 2, n: 10 },
      { key: 'y', k: 8, n: 10 },
    ]);
    expect(result.method).toBe('method_of_moments');
    expect(result.prior.alpha + result.prior.beta).toBeCloseTo(19 / 6.2 - 1, 10);
    expect(result.groups[0].shrunkRate).toBeCloseTo((2 + (19 / 6.2 - 1) / 2) / (10 + 19 / 6.2 - 1), 10);
  });

  it('falls back to a prior worth all the sampled homes when groups agree', () => {
    // Documented fallback: spread no larger than binomial noise → complete pooling, capped at Σn = 30.
    const result = empiricalBayesShrinkage([
      { key: 'a', k: 2, n: 10 },
      { key: 'b', k: 2, n: 10 },
      { key: 'c', k: 2, n: 10 },
    ]);
    expect(result.method).toBe('pooled_fallback');
    expect(result.prior.alpha + result.prior.beta).toBeCloseTo(30, 10);
    expect(result.prior.alpha / (result.prior.alpha + result.prior.beta)).toBeCloseTo(0.2, 10);
  });

  it('shrinks towards the parent population when one is given', () => {
    // Documented behaviour: parent rate 100/500 = 0.2 sets the prior mean.
    const result = empiricalBayesShrinkage([{ key: 'only', k: 4, n: 5 }], { k: 100, n: 500 });
    expect(result.pooledRate).toBeCloseTo(0.2, 12);
    expect(result.groups[0].shrunkRate).toBeLessThan(0.8);
    expect(result.groups[0].shrunkRate).toBeGreaterThan(0.2);
  });

  it('keeps a proper prior when no group has failed', () => {
    // Jeffreys' ½ floor keeps α > 0 (documented fallback).
    const result = empiricalBayesShrinkage([
      { key: 'a', k: 0, n: 6 },
      { key: 'b', k: 0, n: 4 },
      { key: 'empty', k: 0, n: 0 },
    ]);
    expect(result.prior.alpha).toBeGreaterThan(0);
    expect(result.groups[2].rawRate).toBeNull();
    expect(result.groups[0].shrunkRate).toBeGreaterThan(0);
  });
});
