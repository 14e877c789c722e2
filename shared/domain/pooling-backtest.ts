// Borrowing strength across communities: a builder × community failure rate is estimated with
// partial pooling towards the builder's other communities, and a back-test shows whether that
// beats judging a community on its own few homes (issue "Borrowing strength").

import {
  logBeta,
  MIN_PRIOR_PARAMETER,
  MIN_PRIOR_STRENGTH,
  posteriorBeta,
  regularizedIncompleteBeta,
  type BetaParams,
} from './statistics';

export interface PoolingGroup {
  /** Identifies the group, e.g. `${builderId}|${communityId}`. */
  key: string;
  /** The population the group borrows from, e.g. the builder's id. */
  parentKey: string;
  /** Failures among the sampled homes. */
  k: number;
  /** Sampled homes. */
  n: number;
}

export type PriorSource = 'same_parent' | 'all_groups' | 'uniform';

export interface RestPrior {
  prior: BetaParams;
  source: PriorSource;
  /** Groups with data the prior was fitted from. */
  groupsUsed: number;
  /** Sampled homes the prior was fitted from. */
  homesUsed: number;
}

export const UNIFORM_PRIOR: BetaParams = { alpha: 1, beta: 1 };

/** Sufficient statistics of a set of groups with data: G, Σn, Σk and Σk²/n (so S = Σn(r − μ)² = Σk²/n − (Σk)²/Σn). */
interface Totals {
  groups: number;
  n: number;
  k: number;
  kSquaredOverN: number;
}

const EMPTY: Totals = { groups: 0, n: 0, k: 0, kSquaredOverN: 0 };

function add(t: Totals, g: { k: number; n: number }, sign: 1 | -1): Totals {
  if (g.n <= 0) return t;
  return { groups: t.groups + sign, n: t.n + sign * g.n, k: t.k + sign * g.k, kSquaredOverN: t.kSquaredOverN + (sign * g.k * g.k) / g.n };
}

/**
 * The same method-of-moments Beta prior as `empiricalBayesShrinkage` (no parent: the mean is
 * Σk/Σn of the groups themselves), computed from sufficient statistics so that holding out one
 * group at a time costs O(1) rather than a refit over every other group. The unit test holds
 * the two to the same answer.
 */
function momentPrior(t: Totals): BetaParams {
  const pooledRate = t.n > 0 ? t.k / t.n : 0.5;
  const maxStrength = Math.max(MIN_PRIOR_STRENGTH, t.n);
  let strength = maxStrength;
  const effectiveGroups = t.groups - 1;
  if (t.groups >= 2 && pooledRate > 0 && pooledRate < 1 && t.n > effectiveGroups) {
    const spread = Math.max(0, t.kSquaredOverN - (t.k * t.k) / t.n);
    const rho = (spread / (pooledRate * (1 - pooledRate)) - effectiveGroups) / (t.n - effectiveGroups);
    if (rho > 0) strength = Math.min(maxStrength, Math.max(MIN_PRIOR_STRENGTH, 1 / rho - 1));
  }
  return {
    alpha: Math.max(MIN_PRIOR_PARAMETER, pooledRate * strength),
    beta: Math.max(MIN_PRIOR_PARAMETER, (1 - pooledRate) * strength),
  };
}

/** Leave-one-out priors for every group at once: O(groups) after one pass of totals. */
function restPriors(groups: readonly PoolingGroup[]): RestPrior[] {
  let all = EMPTY;
  const byParent = new Map<string, Totals>();
  for (const g of groups) {
    all = add(all, g, 1);
    byParent.set(g.parentKey, add(byParent.get(g.parentKey) ?? EMPTY, g, 1));
  }
  return groups.map((g) => {
    const siblings = add(byParent.get(g.parentKey)!, g, -1);
    const others = add(all, g, -1);
    const [used, source]: [Totals, PriorSource] =
      siblings.groups > 0 ? [siblings, 'same_parent'] : others.groups > 0 ? [others, 'all_groups'] : [EMPTY, 'uniform'];
    if (used.groups === 0) return { prior: UNIFORM_PRIOR, source, groupsUsed: 0, homesUsed: 0 };
    return { prior: momentPrior(used), source, groupsUsed: used.groups, homesUsed: used.n };
  });
}

/**
 * The Beta prior for one group fitted from every *other* group with data (the group's own homes
 * are held out, so they are never counted twice when the prior is then updated with them):
 * empirical-Bayes beta-binomial shrinkage (the method of moments of `empiricalBayesShrinkage`)
 * over the other groups of the same parent; over every other group when the parent has none;
 * Beta(1, 1) when nothing else has data.
 */
export function priorFromRest(groups: readonly PoolingGroup[], heldOutKey: string, parentKey: string): RestPrior {
  const rest = groups.filter((g) => g.key !== heldOutKey);
  return restPriors([...rest, { key: heldOutKey, parentKey, k: 0, n: 0 }])[rest.length];
}

/**
 * Beta(a, b) quantile by Newton's method on the CDF inside a shrinking bisection bracket:
 * the same answer as `betaQuantile` (bisection) in a handful of CDF evaluations instead of
 * about fifty, which matters when a comparison has thousands of cells.
 */
/**
 * Standard normal quantile, Abramowitz & Stegun (1964) 26.2.23 (absolute error < 4.5e-4): only a
 * starting point for Newton in `betaQuantileFast`, never an answer.
 */
function normalQuantileApprox(p: number): number {
  const q = p < 0.5 ? p : 1 - p;
  const t = Math.sqrt(-2 * Math.log(q));
  const z = t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  return p < 0.5 ? -z : z;
}

export function betaQuantileFast(p: number, a: number, b: number): number {
  if (p <= 0) return 0;
  if (p >= 1) return 1;
  const logNorm = logBeta(a, b);
  let low = 0;
  let high = 1;
  // Start where a normal with the Beta's mean and variance puts the quantile, so Newton needs two or
  // three steps instead of five or six; the bracket keeps the answer the same as from any start.
  const mean = a / (a + b);
  const sd = Math.sqrt((a * b) / ((a + b) ** 2 * (a + b + 1)));
  let x = Math.min(0.999, Math.max(0.001, mean + normalQuantileApprox(p) * sd));
  for (let i = 0; i < 100; i += 1) {
    const f = regularizedIncompleteBeta(x, a, b) - p;
    if (f < 0) low = x;
    else high = x;
    if (Math.abs(f) < 1e-13 || high - low < 1e-14) break;
    const density = Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - logNorm);
    const step = density > 0 && Number.isFinite(density) ? x - f / density : NaN;
    // Newton when it stays inside the bracket, bisection otherwise.
    x = step > low && step < high ? step : (low + high) / 2;
  }
  return x;
}

export interface PooledEstimate {
  key: string;
  k: number;
  n: number;
  rawRate: number | null;
  /** Posterior mean with the prior from the rest, updated with the group's own k of n. */
  pooledRate: number;
  /** 95 % equal-tailed posterior interval. */
  lower: number;
  upper: number;
  prior: BetaParams;
  priorSource: PriorSource;
}

/** Partially pooled estimate of every group: prior from the other groups (`priorFromRest`), updated with its own homes. */
export function pooledEstimates(groups: readonly PoolingGroup[]): PooledEstimate[] {
  const priors = restPriors(groups);
  return groups.map((g, i) => {
    const rest = priors[i];
    const post = posteriorBeta(rest.prior, g.k, g.n);
    return {
      key: g.key,
      k: g.k,
      n: g.n,
      rawRate: g.n > 0 ? g.k / g.n : null,
      pooledRate: post.alpha / (post.alpha + post.beta),
      lower: betaQuantileFast(0.025, post.alpha, post.beta),
      upper: betaQuantileFast(0.975, post.alpha, post.beta),
      prior: rest.prior,
      priorSource: rest.source,
    };
  });
}

/** ln C(n, r) by summing logs (exact enough for the hundreds of homes a community has). */
function logChoose(n: number, r: number): number {
  if (r < 0 || r > n) return -Infinity;
  let s = 0;
  for (let i = 1; i <= r; i += 1) s += Math.log(n - r + i) - Math.log(i);
  return s;
}

/**
 * P(j failures among s homes drawn without replacement from n homes of which k failed):
 * the hypergeometric distribution, C(k, j) C(n − k, s − j) / C(n, s).
 */
export function hypergeometricPmf(j: number, n: number, k: number, s: number): number {
  return Math.exp(logChoose(k, j) + logChoose(n - k, s - j) - logChoose(n, s));
}

export interface BacktestRow {
  key: string;
  parentKey: string;
  n: number;
  k: number;
  /** The community's own rate over all its sampled homes: what the predictions are scored against. */
  actualRate: number;
  /** The rest's prior mean: the prediction with none of the community's homes seen. */
  restRate: number;
  priorSource: PriorSource;
  /** Expected |prediction − actual| over every way of having seen `seen` of the n homes first. */
  errorRaw: number;
  errorPooled: number;
  /** |rest's prior mean − actual|: the community held out entirely. */
  errorRestOnly: number;
}

export interface BacktestResult {
  seen: number;
  rows: BacktestRow[];
  /** Mean absolute errors over the groups scored (proportions, 0–1); null when no group qualifies. */
  meanErrorRaw: number | null;
  meanErrorPooled: number | null;
  meanErrorRestOnly: number | null;
  /** Groups scored: those with more sampled homes than `seen`. */
  groupsScored: number;
}

/**
 * Leave-one-group-out back-test of the pooling. For each group with more than `seen` sampled
 * homes: hold its homes out, fit the prior from the rest (`priorFromRest`), then score three
 * predictions of its actual rate k / n, as if only `seen` of its homes had been sampled so far:
 * - raw: the rate among the homes seen, j / seen;
 * - pooled: the posterior mean (α + j) / (α + β + seen) with the rest's prior;
 * - rest only: the rest's prior mean, with none of the group's homes seen.
 * Which homes get seen first is unknown, so the raw and pooled errors are exact expectations
 * over the hypergeometric number of failures j among the homes seen (every subset equally
 * likely) rather than one arbitrary draw.
 */
export function backtestPooling(groups: readonly PoolingGroup[], options: { seen?: number } = {}): BacktestResult {
  const seen = options.seen ?? 2;
  if (!Number.isInteger(seen) || seen < 1) throw new RangeError('seen must be a whole number ≥ 1');
  const rows: BacktestRow[] = [];
  const priors = restPriors(groups);
  for (const [i, g] of groups.entries()) {
    if (g.n <= seen) continue;
    const rest = priors[i];
    const { alpha, beta } = rest.prior;
    const actual = g.k / g.n;
    let errorRaw = 0;
    let errorPooled = 0;
    for (let j = Math.max(0, seen - (g.n - g.k)); j <= Math.min(seen, g.k); j += 1) {
      const p = hypergeometricPmf(j, g.n, g.k, seen);
      errorRaw += p * Math.abs(j / seen - actual);
      errorPooled += p * Math.abs((alpha + j) / (alpha + beta + seen) - actual);
    }
    const restRate = alpha / (alpha + beta);
    rows.push({
      key: g.key,
      parentKey: g.parentKey,
      n: g.n,
      k: g.k,
      actualRate: actual,
      restRate,
      priorSource: rest.source,
      errorRaw,
      errorPooled,
      errorRestOnly: Math.abs(restRate - actual),
    });
  }
  const mean = (pick: (r: BacktestRow) => number) => (rows.length ? rows.reduce((s, r) => s + pick(r), 0) / rows.length : null);
  return {
    seen,
    rows,
    meanErrorRaw: mean((r) => r.errorRaw),
    meanErrorPooled: mean((r) => r.errorPooled),
    meanErrorRestOnly: mean((r) => r.errorRestOnly),
    groupsScored: rows.length,
  };
}

/** How the pooling works, in plain words, for the comparison page and the quote. */
export const POOLING_METHOD =
  'Partial pooling by empirical-Bayes beta-binomial shrinkage (Efron & Morris 1975; Casella 1985): ' +
  "each builder's community is given a Beta prior fitted by the method of moments to the builder's other communities " +
  '(its own homes held out), then updated with its own sampled homes. A community with few sampled homes stays close ' +
  "to the builder's other communities; one with many is judged mostly on its own.";
