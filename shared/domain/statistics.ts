// Community statistics: binomial intervals for failure rates, sample sizes, the
// beta-binomial predictive used for quotes, and empirical-Bayes shrinkage across groups.
// Small samples must show their uncertainty (PRODUCT.md computation 5), so every rate here
// comes with an interval or a distribution rather than a bare percentage.

// ---------------------------------------------------------------------------------------
// Special functions
// ---------------------------------------------------------------------------------------

/**
 * Standard normal quantile Φ⁻¹(p), Wichura (1988) algorithm AS 241 (PPND16), accurate to
 * about 1e-16 — the same algorithm R's qnorm uses.
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) {
    if (p === 0) return -Infinity;
    if (p === 1) return Infinity;
    throw new RangeError(`Probability must be in [0, 1]: ${p}`);
  }
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (
      (q *
        (((((((r * 2509.0809287301226727 + 33430.575583588128105) * r + 67265.770927008700853) * r +
          45921.953931549871457) * r + 13731.693765509461125) * r + 1971.5909503065514427) * r +
          133.14166789178437745) * r + 3.387132872796366608)) /
      (((((((r * 5226.495278852545925 + 28729.085735721942674) * r + 39307.89580009271061) * r +
        21213.794301586595867) * r + 5394.1960214247511077) * r + 687.1870074920579083) * r +
        42.313330701600911252) * r + 1)
    );
  }
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let value: number;
  if (r <= 5) {
    r -= 1.6;
    value =
      (((((((r * 7.7454501427834140764e-4 + 0.0227238449892691845833) * r + 0.24178072517745061177) * r +
        1.27045825245236838258) * r + 3.64784832476320460504) * r + 5.7694972214606914055) * r +
        4.6303378461565452959) * r + 1.42343711074968357734) /
      (((((((r * 1.05075007164441684324e-9 + 5.475938084995344946e-4) * r + 0.0151986665636164571966) * r +
        0.14810397642748007459) * r + 0.68976733498510000455) * r + 1.6763848301838038494) * r +
        2.05319162663775882187) * r + 1);
  } else {
    r -= 5;
    value =
      (((((((r * 2.01033439929228813265e-7 + 2.71155556874348757815e-5) * r + 0.0012426609473880784386) * r +
        0.026532189526576123093) * r + 0.29656057182850489123) * r + 1.7848265399172913358) * r +
        5.4637849111641143699) * r + 6.6579046435011037772) /
      (((((((r * 2.04426310338993978564e-15 + 1.4215117583164458887e-7) * r + 1.8463183175100546818e-5) * r +
        7.868691311456132591e-4) * r + 0.0148753612908506148525) * r + 0.13692988092273580531) * r +
        0.59983220655588793769) * r + 1);
  }
  return q < 0 ? -value : value;
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0 by the Lanczos approximation (g = 7, 9 terms; ~15 significant digits). */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma needs x > 0: ${x}`);
  if (x < 0.5) {
    // Reflection, Γ(x)Γ(1−x) = π / sin(πx), keeps the series in its accurate range.
    return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i += 1) sum += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b). */
export function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

/** Continued fraction for the incomplete beta (Numerical Recipes §6.4, modified Lentz). */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 10_000; m += 1) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) break;
  }
  return h;
}

/** Regularised incomplete beta I_x(a, b), the Beta(a, b) CDF (Numerical Recipes §6.4). */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (!(a > 0 && b > 0)) throw new RangeError('Beta parameters must be > 0');
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b));
  // The continued fraction converges fast only on this side of the mean; use symmetry otherwise.
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(x, a, b)) / a;
  return 1 - (front * betaContinuedFraction(1 - x, b, a)) / b;
}

/** Beta(a, b) quantile by bisection on the CDF (monotone, so bisection cannot miss). */
export function betaQuantile(p: number, a: number, b: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`Probability must be in [0, 1]: ${p}`);
  if (p === 0) return 0;
  if (p === 1) return 1;
  let low = 0;
  let high = 1;
  for (let i = 0; i < 200 && high - low > 1e-15; i += 1) {
    const mid = (low + high) / 2;
    if (regularizedIncompleteBeta(mid, a, b) < p) low = mid;
    else high = mid;
  }
  return (low + high) / 2;
}

function zForConfidence(confidence: number): number {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`Confidence must be in (0, 1): ${confidence}`);
  return normalQuantile(1 - (1 - confidence) / 2);
}

function checkCounts(k: number, n: number): void {
  if (!Number.isInteger(k) || !Number.isInteger(n) || k < 0 || n < 0 || k > n) {
    throw new RangeError(`Counts must be integers with 0 ≤ k ≤ n (k = ${k}, n = ${n})`);
  }
}

// ---------------------------------------------------------------------------------------
// Binomial intervals and summaries
// ---------------------------------------------------------------------------------------

export interface RateInterval {
  /** k / n; NaN when n = 0 (no data, and the interval is the whole of [0, 1]). */
  rate: number;
  lower: number;
  upper: number;
}

/**
 * Wilson (1927) score interval for a binomial proportion, without continuity correction
 * (Newcombe 1998, method 3). Preferred for small samples: never outside [0, 1] and close to
 * nominal coverage even at k = 0.
 */
export function wilsonInterval(k: number, n: number, confidence = 0.95): RateInterval {
  checkCounts(k, n);
  if (n === 0) return { rate: Number.NaN, lower: 0, upper: 1 };
  const z = zForConfidence(confidence);
  const p = k / n;
  const z2 = z * z;
  const denominator = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denominator;
  const half = (z / denominator) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  return {
    rate: p,
    lower: k === 0 ? 0 : Math.max(0, centre - half),
    upper: k === n ? 1 : Math.min(1, centre + half),
  };
}

/**
 * Clopper–Pearson (1934) "exact" interval from Beta quantiles (Newcombe 1998, method 5):
 * lower = B⁻¹(α/2; k, n − k + 1), upper = B⁻¹(1 − α/2; k + 1, n − k).
 */
export function clopperPearsonInterval(k: number, n: number, confidence = 0.95): RateInterval {
  checkCounts(k, n);
  if (n === 0) return { rate: Number.NaN, lower: 0, upper: 1 };
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`Confidence must be in (0, 1): ${confidence}`);
  const tail = (1 - confidence) / 2;
  return {
    rate: k / n,
    lower: k === 0 ? 0 : betaQuantile(tail, k, n - k + 1),
    upper: k === n ? 1 : betaQuantile(1 - tail, k + 1, n - k),
  };
}

/** Median of the finite values; null for an empty list. */
export function median(values: readonly number[]): number | null {
  const sorted = values.filter((v) => Number.isFinite(v)).sort((a, b) => a - b);
  if (sorted.length === 0) return null;
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

// ---------------------------------------------------------------------------------------
// Sample size
// ---------------------------------------------------------------------------------------

export interface CochranInput {
  /** Half-width of the interval on the proportion, e.g. 0.1 for ±10 points. */
  marginOfError: number;
  /** Anticipated proportion; 0.5 is the conservative (largest) choice. */
  expectedRate?: number;
  confidence?: number;
  /** Overrides the z from `confidence`, for tables that use the rounded 1.96. */
  z?: number;
}

/**
 * Cochran's sample size for a proportion before the finite-population correction,
 * n₀ = z² p (1 − p) / d² (Cochran, Sampling Techniques, 3rd ed., 1977, §4.4).
 */
export function cochranInitialSampleSize(input: CochranInput): number {
  const { marginOfError, expectedRate = 0.5, confidence = 0.95 } = input;
  if (!(marginOfError > 0 && marginOfError < 1)) throw new RangeError('Margin of error must be in (0, 1)');
  if (!(expectedRate >= 0 && expectedRate <= 1)) throw new RangeError('Expected rate must be in [0, 1]');
  const z = input.z ?? zForConfidence(confidence);
  return (z * z * expectedRate * (1 - expectedRate)) / (marginOfError * marginOfError);
}

/**
 * Homes to sample: Cochran's n₀ with the finite-population correction
 * n = n₀ / (1 + (n₀ − 1)/N) when the population size N is given, rounded up
 * (Cochran 1977 §4.4). Never more than N.
 */
export function cochranSampleSize(input: CochranInput & { populationSize?: number }): number {
  const n0 = cochranInitialSampleSize(input);
  const { populationSize } = input;
  if (populationSize === undefined) return Math.ceil(n0);
  if (!Number.isInteger(populationSize) || populationSize < 0) throw new RangeError('Population size must be a whole number ≥ 0');
  if (populationSize === 0) return 0;
  const corrected = n0 / (1 + (n0 - 1) / populationSize);
  // Trim binary noise so an exact integer result is not rounded up to the next home.
  return Math.min(populationSize, Math.ceil(Number(corrected.toPrecision(12))));
}

// ---------------------------------------------------------------------------------------
// Beta-binomial predictive
// ---------------------------------------------------------------------------------------

export interface BetaParams {
  alpha: number;
  beta: number;
}

/** Conjugate update: Beta(α, β) prior and k failures in n → Beta(α + k, β + n − k). */
export function posteriorBeta(prior: BetaParams, k: number, n: number): BetaParams {
  checkCounts(k, n);
  if (!(prior.alpha > 0 && prior.beta > 0)) throw new RangeError('Prior parameters must be > 0');
  return { alpha: prior.alpha + k, beta: prior.beta + n - k };
}

export interface BetaBinomialDistribution {
  mean: number;
  variance: number;
  /** P(X = j). */
  pmf(j: number): number;
  /** P(X ≤ j). */
  cdf(j: number): number;
  /** Smallest j with P(X ≤ j) ≥ p. */
  quantile(p: number): number;
}

/**
 * Beta-binomial distribution of failures among m further homes when the failure rate is
 * Beta(α, β) — the posterior predictive after `posteriorBeta` (e.g. Gelman et al., Bayesian
 * Data Analysis, 3rd ed., conjugate binomial model). mean = mα/(α+β);
 * variance = mαβ(α+β+m) / ((α+β)²(α+β+1));
 * pmf(j) = C(m, j) B(j+α, m−j+β) / B(α, β).
 */
export function betaBinomialPredictive(input: BetaParams & { m: number }): BetaBinomialDistribution {
  const { alpha, beta, m } = input;
  if (!(alpha > 0 && beta > 0)) throw new RangeError('Beta parameters must be > 0');
  if (!Number.isInteger(m) || m < 0) throw new RangeError('m must be a whole number ≥ 0');
  const s = alpha + beta;
  const mean = (m * alpha) / s;
  const variance = (m * alpha * beta * (s + m)) / (s * s * (s + 1));

  const logNorm = logBeta(alpha, beta);
  const logMFactorial = logGamma(m + 1);
  const pmfs: number[] = [];
  for (let j = 0; j <= m; j += 1) {
    const logChoose = logMFactorial - logGamma(j + 1) - logGamma(m - j + 1);
    pmfs.push(Math.exp(logChoose + logBeta(j + alpha, m - j + beta) - logNorm));
  }
  const cdfs: number[] = [];
  let running = 0;
  for (const value of pmfs) {
    running += value;
    cdfs.push(Math.min(1, running));
  }

  return {
    mean,
    variance,
    pmf: (j) => (Number.isInteger(j) && j >= 0 && j <= m ? pmfs[j] : 0),
    cdf: (j) => (j < 0 ? 0 : j >= m ? 1 : cdfs[Math.floor(j)]),
    quantile: (p) => {
      if (!(p >= 0 && p <= 1)) throw new RangeError(`Probability must be in [0, 1]: ${p}`);
      // A tolerance of 1e-12 stops summation rounding from pushing the answer one step up.
      const index = cdfs.findIndex((c) => c >= p - 1e-12);
      return index === -1 ? m : index;
    },
  };
}

// ---------------------------------------------------------------------------------------
// Empirical-Bayes shrinkage across groups
// ---------------------------------------------------------------------------------------

export interface ShrinkageGroupInput {
  key: string;
  k: number;
  n: number;
}

export interface ShrinkageGroupResult extends ShrinkageGroupInput {
  /** k / n, or null when nothing was sampled. */
  rawRate: number | null;
  /** Posterior mean (k + α) / (n + α + β). */
  shrunkRate: number;
  /** 95 % equal-tailed posterior interval. */
  lower: number;
  upper: number;
}

export interface ShrinkageResult {
  groups: ShrinkageGroupResult[];
  /** The rate groups are shrunk towards: the parent's rate if given, else Σk / Σn. */
  pooledRate: number;
  prior: BetaParams;
  method: 'method_of_moments' | 'pooled_fallback';
  /** Plain-English description of how the prior was chosen, for the UI. */
  note: string;
}

/** Smallest prior strength α + β the moment fit may return (one pseudo-success and one pseudo-failure). */
export const MIN_PRIOR_STRENGTH = 2;
/** Floor on α and β so the prior stays proper when the pooled rate is 0 or 1 (Jeffreys' ½). */
export const MIN_PRIOR_PARAMETER = 0.5;

/**
 * Empirical-Bayes shrinkage of group failure rates towards a common rate (Efron & Morris
 * 1975, JASA 70:311; Casella 1985, Am. Statistician 39:83). The Beta prior's mean is the
 * parent's rate when given, else the pooled rate Σk/Σn; its strength comes from the method
 * of moments on the n-weighted spread of group rates for a beta-binomial (Kleinman 1973,
 * JASA 68:46 — from memory): with S = Σ nᵢ(rᵢ − μ)², the intra-class correlation is
 * ρ = (S/(μ(1−μ)) − G′) / (Σn − G′) and α + β = 1/ρ − 1, where G′ is the number of groups
 * (less one when μ is estimated from the same groups).
 *
 * Fallback: when the spread is no more than binomial noise (ρ ≤ 0), fewer than two groups
 * have data, or μ is 0 or 1, the moment fit says "complete pooling" (α + β → ∞). Rather
 * than let the prior swamp the data, its strength is capped at the total sample size Σn —
 * the prior is never worth more than all the homes sampled.
 */
export function empiricalBayesShrinkage(
  groups: readonly ShrinkageGroupInput[],
  parent?: { k: number; n: number },
): ShrinkageResult {
  for (const g of groups) checkCounts(g.k, g.n);
  if (parent) checkCounts(parent.k, parent.n);
  const withData = groups.filter((g) => g.n > 0);
  const totalK = withData.reduce((s, g) => s + g.k, 0);
  const totalN = withData.reduce((s, g) => s + g.n, 0);

  const useParent = parent !== undefined && parent.n > 0;
  const pooledRate = useParent ? parent.k / parent.n : totalN > 0 ? totalK / totalN : 0.5;
  const maxStrength = Math.max(MIN_PRIOR_STRENGTH, totalN);

  let strength = maxStrength;
  let method: ShrinkageResult['method'] = 'pooled_fallback';
  const effectiveGroups = useParent ? withData.length : withData.length - 1;
  if (withData.length >= 2 && pooledRate > 0 && pooledRate < 1 && totalN > effectiveGroups) {
    const spread = withData.reduce((s, g) => s + g.n * (g.k / g.n - pooledRate) ** 2, 0);
    const rho = (spread / (pooledRate * (1 - pooledRate)) - effectiveGroups) / (totalN - effectiveGroups);
    if (rho > 0) {
      strength = Math.min(maxStrength, Math.max(MIN_PRIOR_STRENGTH, 1 / rho - 1));
      method = 'method_of_moments';
    }
  }

  const prior: BetaParams = {
    alpha: Math.max(MIN_PRIOR_PARAMETER, pooledRate * strength),
    beta: Math.max(MIN_PRIOR_PARAMETER, (1 - pooledRate) * strength),
  };
  const note =
    method === 'method_of_moments'
      ? `Prior Beta(${prior.alpha.toFixed(2)}, ${prior.beta.toFixed(2)}) fitted by the method of moments to how much the groups differ.`
      : `Groups differ no more than chance would make them (or too few have data), so each is pulled towards the ${useParent ? 'parent' : 'pooled'} rate with a prior worth ${strength.toFixed(0)} homes.`;

  return {
    pooledRate,
    prior,
    method,
    note,
    groups: groups.map((g) => {
      const posterior = posteriorBeta(prior, g.k, g.n);
      return {
        ...g,
        rawRate: g.n > 0 ? g.k / g.n : null,
        shrunkRate: posterior.alpha / (posterior.alpha + posterior.beta),
        lower: betaQuantile(0.025, posterior.alpha, posterior.beta),
        upper: betaQuantile(0.975, posterior.alpha, posterior.beta),
      };
    }),
  };
}
