// Community quote: price every home's activation and the expected rework among the homes
// not yet sampled, with an upper bound, from the beta-binomial posterior predictive
// (PRODUCT.md computation 6). Prices are whole cents so totals never carry float residue.

import { betaBinomialPredictive, posteriorBeta, type BetaParams } from './statistics';

export interface CommunityQuoteInput {
  /** N: homes in the community (sampled ones included). */
  homesTotal: number;
  /** n: homes already activated as the sample. */
  homesSampled: number;
  /** k: sampled homes that failed (needed rework or tested at or above the action level). */
  failuresSampled: number;
  /** Price of one activation, whole cents. */
  activationPrice: number;
  /** Price of one rework, whole cents. */
  reworkPrice: number;
  /** Probability level of the upper bound (default 0.9: 9 in 10 chances reworks will not exceed it). */
  confidence?: number;
  /** Prior on the failure rate before the sample; default Beta(1, 1), uniform. */
  prior?: BetaParams;
  /** A prior fitted from similar communities (e.g. `empiricalBayesShrinkage`); replaces `prior`. */
  pooledPrior?: BetaParams;
}

export interface CommunityQuote {
  /** N − n. */
  unsampled: number;
  /** Expected reworks among the unsampled homes. */
  expectedReworks: number;
  /** Reworks among the unsampled homes not exceeded with probability `confidence`. */
  upperReworks: number;
  /** Whole cents: activation × N + rework × expected. */
  priceExpected: number;
  /** Whole cents: activation × N + rework × upper. */
  priceUpper: number;
  /** Whole cents per home (of N). */
  perHomeExpected: number;
  perHomeUpper: number;
  /** The prior actually used. */
  prior: BetaParams;
  posterior: BetaParams;
  /** Plain-English statement of the method and prior, printed on the quote. */
  method: string;
}

function requireWholeNumber(value: number, name: string): void {
  if (!Number.isInteger(value) || value < 0) throw new RangeError(`${name} must be a whole number ≥ 0`);
}

/**
 * Prices a community from its sample. The failure rate gets a Beta prior updated with the
 * sample (k failures in n → Beta(α + k, β + n − k)); reworks among the N − n unsampled homes
 * then follow the beta-binomial posterior predictive. The price is activation × N plus
 * rework × expected reworks (PRODUCT.md); the upper price uses the predictive quantile at
 * `confidence`. Sampled homes' known reworks are not re-priced here: they were quoted as
 * they were found.
 */
export function communityQuote(input: CommunityQuoteInput): CommunityQuote {
  const {
    homesTotal,
    homesSampled,
    failuresSampled,
    activationPrice,
    reworkPrice,
    confidence = 0.9,
    prior = { alpha: 1, beta: 1 },
    pooledPrior,
  } = input;
  requireWholeNumber(homesTotal, 'homesTotal');
  requireWholeNumber(homesSampled, 'homesSampled');
  requireWholeNumber(failuresSampled, 'failuresSampled');
  requireWholeNumber(activationPrice, 'activationPrice (cents)');
  requireWholeNumber(reworkPrice, 'reworkPrice (cents)');
  if (homesTotal === 0) throw new RangeError('A community quote needs at least one home');
  if (homesSampled > homesTotal) throw new RangeError('More homes sampled than the community has');
  if (failuresSampled > homesSampled) throw new RangeError('More failures than homes sampled');
  if (!(confidence > 0 && confidence < 1)) throw new RangeError('Confidence must be in (0, 1)');

  const usedPrior = pooledPrior ?? prior;
  const posterior = posteriorBeta(usedPrior, failuresSampled, homesSampled);
  const unsampled = homesTotal - homesSampled;
  const predictive = betaBinomialPredictive({ ...posterior, m: unsampled });
  const expectedReworks = predictive.mean;
  const upperReworks = predictive.quantile(confidence);

  const activationTotal = activationPrice * homesTotal;
  const priceExpected = Math.round(activationTotal + reworkPrice * expectedReworks);
  const priceUpper = activationTotal + reworkPrice * upperReworks;

  const priorText = `Beta(${formatParam(usedPrior.alpha)}, ${formatParam(usedPrior.beta)})${pooledPrior ? ' fitted from similar communities' : ''}`;
  const method =
    `Beta-binomial posterior predictive: prior ${priorText}, updated with ${failuresSampled} failure(s) in ` +
    `${homesSampled} sampled home(s) to Beta(${formatParam(posterior.alpha)}, ${formatParam(posterior.beta)}); ` +
    `expected and ${Math.round(confidence * 100)}th-percentile reworks among ${unsampled} unsampled home(s). ` +
    `Price = activation × ${homesTotal} homes + rework × reworks.`;

  return {
    unsampled,
    expectedReworks,
    upperReworks,
    priceExpected,
    priceUpper,
    perHomeExpected: Math.round(priceExpected / homesTotal),
    perHomeUpper: Math.round(priceUpper / homesTotal),
    prior: usedPrior,
    posterior,
    method,
  };
}

function formatParam(value: number): string {
  return Number.isInteger(value) ? String(value) : value.toFixed(2);
}
