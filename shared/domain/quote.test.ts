import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { communityQuote } from './quote';

// Independent reference: the beta-binomial pmf from jstat's beta function and combinations,
// summed to find the smallest j with P(X ≤ j) ≥ p.
function jstatQuantile(alpha: number, beta: number, m: number, p: number): number {
  let cumulative = 0;
  for (let j = 0; j <= m; j += 1) {
    cumulative += (jStat.combination(m, j) * jStat.betafn(j + alpha, m - j + beta)) / jStat.betafn(alpha, beta);
    if (cumulative >= p - 1e-12) return j;
  }
  return m;
}

// Illustrative prices invented for the test: $450 activation, $600 rework, in cents.
const ACTIVATION = 45_000;
const REWORK = 60_000;

describe('communityQuote', () => {
  it('prices 50 homes with 2 failures in 10 sampled from the PRODUCT.md check values', () => {
    // PRODUCT.md check table (computed): Beta(1, 1) prior, 2 of 10 → 40 unsampled, mean 10.0.
    // Price = 45,000 × 50 + 60,000 × 10 = 2,850,000 cents. Upper reworks: 90th percentile of
    // BetaBin(40, 3, 9) computed independently with jstat.
    const quote = communityQuote({
      homesTotal: 50,
      homesSampled: 10,
      failuresSampled: 2,
      activationPrice: ACTIVATION,
      reworkPrice: REWORK,
    });
    const upper = jstatQuantile(3, 9, 40, 0.9);
    expect(quote.unsampled).toBe(40);
    expect(quote.expectedReworks).toBeCloseTo(10, 12);
    expect(quote.upperReworks).toBe(upper);
    expect(quote.priceExpected).toBe(2_850_000);
    expect(quote.priceUpper).toBe(ACTIVATION * 50 + REWORK * upper);
    expect(quote.perHomeExpected).toBe(57_000);
    expect(quote.posterior).toEqual({ alpha: 3, beta: 9 });
    expect(quote.method).toMatch(/Beta\(1, 1\)/);
  });

  it('keeps every price in whole cents', () => {
    // Mean 40·3/12 would be fractional for other inputs; e.g. 7 unsampled × 3/12 = 1.75 reworks.
    const quote = communityQuote({
      homesTotal: 17,
      homesSampled: 10,
      failuresSampled: 2,
      activationPrice: 45_001,
      reworkPrice: 59_999,
    });
    expect(quote.expectedReworks).toBeCloseTo(1.75, 12);
    for (const cents of [quote.priceExpected, quote.priceUpper, quote.perHomeExpected, quote.perHomeUpper]) {
      expect(Number.isInteger(cents)).toBe(true);
    }
  });

  it('uses the prior alone when nothing was sampled', () => {
    // Beta(1, 1) with no data: BetaBin(20, 1, 1) is uniform on 0…20, mean 10, 90th percentile
    // the smallest j with (j + 1)/21 ≥ 0.9 → j = 18 (arithmetic; cross-checked with jstat).
    const quote = communityQuote({
      homesTotal: 20,
      homesSampled: 0,
      failuresSampled: 0,
      activationPrice: ACTIVATION,
      reworkPrice: REWORK,
    });
    expect(quote.expectedReworks).toBeCloseTo(10, 12);
    expect(quote.upperReworks).toBe(18);
    expect(jstatQuantile(1, 1, 20, 0.9)).toBe(18);
  });

  it('expects most unsampled homes to fail when every sampled home failed', () => {
    // Beta(1, 1) + 5 of 5 → Beta(6, 1); 15 unsampled → mean 15·6/7 = 12.857 (conjugate update,
    // beta-binomial mean); upper bound cross-checked with jstat.
    const quote = communityQuote({
      homesTotal: 20,
      homesSampled: 5,
      failuresSampled: 5,
      activationPrice: ACTIVATION,
      reworkPrice: REWORK,
    });
    expect(quote.expectedReworks).toBeCloseTo((15 * 6) / 7, 12);
    expect(quote.upperReworks).toBe(jstatQuantile(6, 1, 15, 0.9));
    expect(quote.upperReworks).toBeLessThanOrEqual(15);
  });

  it('needs no rework allowance when every home was sampled', () => {
    const quote = communityQuote({
      homesTotal: 8,
      homesSampled: 8,
      failuresSampled: 3,
      activationPrice: ACTIVATION,
      reworkPrice: REWORK,
    });
    expect(quote.unsampled).toBe(0);
    expect(quote.priceExpected).toBe(ACTIVATION * 8);
    expect(quote.priceUpper).toBe(ACTIVATION * 8);
  });

  it('uses a pooled prior from similar communities when given', () => {
    // Conjugate update: Beta(2, 8) + 2 of 10 → Beta(4, 16); 40 unsampled → mean 40·4/20 = 8.
    const quote = communityQuote({
      homesTotal: 50,
      homesSampled: 10,
      failuresSampled: 2,
      activationPrice: ACTIVATION,
      reworkPrice: REWORK,
      pooledPrior: { alpha: 2, beta: 8 },
    });
    expect(quote.prior).toEqual({ alpha: 2, beta: 8 });
    expect(quote.expectedReworks).toBeCloseTo(8, 12);
    expect(quote.method).toMatch(/similar communities/);
  });

  it('raises the upper bound with the confidence asked for', () => {
    const base = { homesTotal: 50, homesSampled: 10, failuresSampled: 2, activationPrice: ACTIVATION, reworkPrice: REWORK };
    expect(communityQuote({ ...base, confidence: 0.95 }).upperReworks).toBeGreaterThanOrEqual(
      communityQuote({ ...base, confidence: 0.8 }).upperReworks,
    );
  });

  it('rejects impossible inputs', () => {
    const base = { homesTotal: 10, homesSampled: 5, failuresSampled: 1, activationPrice: ACTIVATION, reworkPrice: REWORK };
    expect(() => communityQuote({ ...base, failuresSampled: 6 })).toThrow(RangeError);
    expect(() => communityQuote({ ...base, homesSampled: 11 })).toThrow(RangeError);
    expect(() => communityQuote({ ...base, activationPrice: 450.5 })).toThrow(RangeError);
    expect(() => communityQuote({ ...base, homesTotal: 0, homesSampled: 0, failuresSampled: 0 })).toThrow(RangeError);
  });
});
