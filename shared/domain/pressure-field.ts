// Pressure field extension (PFE): how far the sub-slab depressurisation reaches from a
// suction point, fitted from test-hole readings, and whether it covers the slab footprint.

import { area, circle, difference, feature, featureCollection, intersect } from '@turf/turf';
import type { Feature, MultiPolygon, Polygon } from 'geojson';

/**
 * Default target differential at the edge of the field: 1 Pa (≈ 0.004 in. WC). Common
 * practice, not a single number confirmed in the standard, so it is a company setting.
 */
export const DEFAULT_PFE_TARGET_PA = 1;

export interface PressureFieldReading {
  /** Distance of the test hole from the suction point, feet. */
  distanceFt: number;
  /** Sub-slab depressurisation at the hole as a positive magnitude, pascals. */
  differentialPa: number;
}

/** dp(d) = amplitudePa · exp(−decayPerFt · d), fitted on ln dp. */
export interface PressureFieldFit {
  amplitudePa: number;
  decayPerFt: number;
  /** Coefficient of determination of the straight-line fit of ln dp on distance. */
  rSquared: number;
  /** Readings used (those with dp > 0). */
  n: number;
}

/**
 * Fits an exponential decay dp = a·e^(−b·d) by ordinary least squares on ln dp against
 * distance (log-linear regression; sub-slab field decay is commonly modelled as roughly
 * exponential — common practice). Readings with dp ≤ 0 carry no usable log and are left out.
 * Returns null without at least two usable readings at two different distances.
 * r² is on the log scale; with exactly two readings it is 1 by construction.
 */
export function fitPressureField(readings: readonly PressureFieldReading[]): PressureFieldFit | null {
  const usable = readings.filter((r) => r.differentialPa > 0 && Number.isFinite(r.distanceFt));
  const n = usable.length;
  if (n < 2) return null;
  const xs = usable.map((r) => r.distanceFt);
  const ys = usable.map((r) => Math.log(r.differentialPa));
  const meanX = xs.reduce((s, x) => s + x, 0) / n;
  const meanY = ys.reduce((s, y) => s + y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i += 1) {
    sxx += (xs[i] - meanX) ** 2;
    sxy += (xs[i] - meanX) * (ys[i] - meanY);
    syy += (ys[i] - meanY) ** 2;
  }
  if (sxx === 0) return null;
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  const rSquared = syy === 0 ? 1 : (sxy * sxy) / (sxx * syy);
  return { amplitudePa: Math.exp(intercept), decayPerFt: -slope, rSquared, n };
}

/**
 * Distance in feet at which the fitted field falls to the target differential:
 * d = ln(a / target) / b. Returns 0 when even the fitted value at the suction point is below
 * target, and null when the fit does not decay (b ≤ 0), since no radius can be read from it.
 */
export function radiusForTargetFt(fit: PressureFieldFit, targetPa: number = DEFAULT_PFE_TARGET_PA): number | null {
  if (!(targetPa > 0)) throw new RangeError('Target differential must be > 0 Pa');
  if (!(fit.decayPerFt > 0)) return null;
  if (fit.amplitudePa <= targetPa) return 0;
  return Math.log(fit.amplitudePa / targetPa) / fit.decayPerFt;
}

export interface FootprintCoverage {
  /** Share of the footprint's area inside the field circle, 0–1. */
  coveredFraction: number;
  fullyCovered: boolean;
}

/** Points on the circle polygon; 128 keeps the inscribed polygon within 0.03 % of the radius. */
const CIRCLE_STEPS = 128;

/**
 * Share of a slab footprint inside the circle of the given radius around the suction point,
 * computed geodesically with turf (circle → intersect → area). `fullyCovered` is true when
 * nothing of the footprint lies outside the circle.
 */
export function footprintCoverage(input: {
  suctionPoint: [number, number];
  radiusFt: number;
  footprint: Polygon | MultiPolygon | Feature<Polygon | MultiPolygon>;
}): FootprintCoverage {
  const { suctionPoint, radiusFt } = input;
  const footprint = input.footprint.type === 'Feature' ? input.footprint : feature(input.footprint);
  const footprintArea = area(footprint);
  if (!(footprintArea > 0)) throw new RangeError('Footprint has no area');
  if (!(radiusFt > 0)) return { coveredFraction: 0, fullyCovered: false };

  const field = circle(suctionPoint, radiusFt, { units: 'feet', steps: CIRCLE_STEPS });
  const inside = intersect(featureCollection<Polygon | MultiPolygon>([footprint, field]));
  const outside = difference(featureCollection<Polygon | MultiPolygon>([footprint, field]));
  const coveredFraction = inside ? Math.min(1, area(inside) / footprintArea) : 0;
  // A sliver of floating-point noise along a shared edge is not a gap in coverage.
  const fullyCovered = outside === null || area(outside) / footprintArea < 1e-9;
  return { coveredFraction: fullyCovered ? 1 : coveredFraction, fullyCovered };
}
