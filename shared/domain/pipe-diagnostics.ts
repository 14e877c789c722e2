// Fan and pipe diagnostics for sub-slab depressurisation systems: Darcy–Weisbach pressure
// loss in PVC Schedule 40 vent pipe, the fan's operating point, the airflow implied by a
// manometer reading, and what that reading suggests about the sub-slab.

import { FT_TO_M, cfmToLps, paToInWc } from './units';

export type PipeNominalSizeIn = 2 | 3 | 4 | 6;

/** PVC Schedule 40 inside diameters, inches: OD minus twice the minimum wall (ASTM D1785). */
export const PVC_SCH40_INSIDE_DIAMETER_IN: Readonly<Record<PipeNominalSizeIn, number>> = {
  2: 2.067, // OD 2.375, wall 0.154
  3: 3.068, // OD 3.500, wall 0.216
  4: 4.026, // OD 4.500, wall 0.237
  6: 6.065, // OD 6.625, wall 0.280
};

/** Absolute roughness of PVC, 0.0015 mm (common engineering tables, e.g. Binder 1973). */
export const PVC_ROUGHNESS_MM = 0.0015;

/** Dry air at 20 °C and 101.325 kPa (standard air tables). */
export const AIR_20C_DENSITY_KG_M3 = 1.2041;
/** Dynamic viscosity of air at 20 °C (standard air tables). */
export const AIR_20C_VISCOSITY_PA_S = 1.813e-5;

/** A 90° elbow counts as 30 pipe diameters of straight pipe (2018 IRC App. A, Table A.2.2). */
export const ELBOW_L_OVER_D = 30;

/**
 * Below this Reynolds number flow in a round pipe is taken as laminar, f = 64/Re
 * (the usual textbook value; common practice).
 */
export const LAMINAR_REYNOLDS_LIMIT = 2300;

const IN_TO_M = 0.0254;

/** Inside diameter in metres of a PVC Schedule 40 pipe (ASTM D1785). */
export function pipeInsideDiameterM(nominalSizeIn: PipeNominalSizeIn): number {
  const insideIn = PVC_SCH40_INSIDE_DIAMETER_IN[nominalSizeIn];
  if (insideIn === undefined) throw new RangeError(`Unsupported nominal pipe size: ${nominalSizeIn}"`);
  return insideIn * IN_TO_M;
}

/** Mean air velocity in m/s for a flow in CFM through a PVC Sch 40 pipe. */
export function airVelocityMS(flowCfm: number, nominalSizeIn: PipeNominalSizeIn): number {
  const diameterM = pipeInsideDiameterM(nominalSizeIn);
  return cfmToLps(flowCfm) / 1000 / ((Math.PI / 4) * diameterM * diameterM);
}

export interface AirProperties {
  densityKgM3?: number;
  viscosityPaS?: number;
}

/**
 * Reynolds number Re = ρVD/μ for air in a PVC Sch 40 pipe (defaults: air at 20 °C).
 */
export function reynoldsNumber(input: { flowCfm: number; nominalSizeIn: PipeNominalSizeIn } & AirProperties): number {
  const { flowCfm, nominalSizeIn, densityKgM3 = AIR_20C_DENSITY_KG_M3, viscosityPaS = AIR_20C_VISCOSITY_PA_S } = input;
  return (densityKgM3 * airVelocityMS(flowCfm, nominalSizeIn) * pipeInsideDiameterM(nominalSizeIn)) / viscosityPaS;
}

/**
 * Swamee–Jain explicit friction factor (Swamee & Jain 1976, J. Hydraulics Div. ASCE 102(5)):
 * f = 0.25 / [log10(ε/(3.7D) + 5.74/Re^0.9)]², stated within about 1 % of Colebrook for
 * 10⁻⁶ ≤ ε/D ≤ 10⁻² and 5000 ≤ Re ≤ 10⁸ (≈ 1.3 % in PVC vent pipe, up to ≈ 3 % in the rough,
 * low-Re corner). Used as Colebrook's starting value and as a quick estimate.
 */
export function swameeJainFrictionFactor(reynolds: number, relativeRoughness: number): number {
  if (!(reynolds > 0) || !(relativeRoughness >= 0)) throw new RangeError('Reynolds number must be > 0 and roughness ≥ 0');
  const logTerm = Math.log10(relativeRoughness / 3.7 + 5.74 / reynolds ** 0.9);
  return 0.25 / (logTerm * logTerm);
}

/**
 * Colebrook (1939) Darcy friction factor for turbulent flow,
 * 1/√f = −2 log10(ε/(3.7D) + 2.51/(Re √f)), solved by Newton's method on x = 1/√f from the
 * Swamee–Jain start until the step is below 1e-12 (converges in a handful of steps).
 */
export function colebrookFrictionFactor(reynolds: number, relativeRoughness: number): number {
  let x = 1 / Math.sqrt(swameeJainFrictionFactor(reynolds, relativeRoughness));
  const a = relativeRoughness / 3.7;
  const b = 2.51 / reynolds;
  for (let i = 0; i < 50; i += 1) {
    const inner = a + b * x;
    const residual = x + 2 * Math.log10(inner);
    const slope = 1 + (2 / Math.LN10) * (b / inner);
    const step = residual / slope;
    x -= step;
    if (Math.abs(step) < 1e-12 * Math.abs(x)) break;
  }
  return 1 / (x * x);
}

/** Equivalent length in metres of one 90° elbow: L/D = 30 (2018 IRC App. A, Table A.2.2). */
export function elbowEquivalentLengthM(nominalSizeIn: PipeNominalSizeIn): number {
  return ELBOW_L_OVER_D * pipeInsideDiameterM(nominalSizeIn);
}

export interface PipeRun {
  nominalSizeIn: PipeNominalSizeIn;
  /** Straight pipe length, feet. */
  lengthFt: number;
  /** Number of 90° elbows (45° fittings can be entered as halves). */
  elbows: number;
}

/**
 * Friction loss in pascals for air at 20 °C through a PVC Sch 40 run, by Darcy–Weisbach,
 * Δp = f (L/D) ρV²/2, with elbows as equivalent length and f from Colebrook (turbulent) or
 * 64/Re (laminar, Re < 2300).
 */
export function pipePressureLossPa(input: PipeRun & { flowCfm: number } & AirProperties): number {
  const { flowCfm, nominalSizeIn, lengthFt, elbows, densityKgM3 = AIR_20C_DENSITY_KG_M3 } = input;
  if (flowCfm < 0 || lengthFt < 0 || elbows < 0) throw new RangeError('Flow, length and elbows must be ≥ 0');
  if (flowCfm === 0) return 0;
  const diameterM = pipeInsideDiameterM(nominalSizeIn);
  const reynolds = reynoldsNumber(input);
  const friction =
    reynolds < LAMINAR_REYNOLDS_LIMIT
      ? 64 / reynolds
      : colebrookFrictionFactor(reynolds, PVC_ROUGHNESS_MM / 1000 / diameterM);
  const lengthM = lengthFt * FT_TO_M + elbows * elbowEquivalentLengthM(nominalSizeIn);
  const velocityMS = airVelocityMS(flowCfm, nominalSizeIn);
  return friction * (lengthM / diameterM) * ((densityKgM3 * velocityMS * velocityMS) / 2);
}

/** The system curve of a pipe run in in. WC as a function of flow, for `operatingPoint`. */
export function pipeLossCurveInWc(run: PipeRun): (flowCfm: number) => number {
  return (flowCfm) => paToInWc(pipePressureLossPa({ ...run, flowCfm }));
}

export interface FanCurvePoint {
  flowCfm: number;
  staticInWc: number;
}

/** A fan's published curve: static pressure falling as flow rises. */
export interface FanCurve {
  points: FanCurvePoint[];
}

/** Sorts and validates a fan curve: ≥ 2 points, distinct flows, static not rising with flow. */
function sortedPoints(curve: FanCurve): FanCurvePoint[] {
  const points = [...curve.points].sort((a, b) => a.flowCfm - b.flowCfm);
  if (points.length < 2) throw new RangeError('A fan curve needs at least two points');
  for (let i = 1; i < points.length; i += 1) {
    if (points[i].flowCfm === points[i - 1].flowCfm) throw new RangeError('Fan curve flows must be distinct');
    if (points[i].staticInWc > points[i - 1].staticInWc) {
      throw new RangeError('Fan curve static pressure must not rise with flow');
    }
  }
  return points;
}

/** Highest static pressure (at the lowest published flow) and highest published flow. */
export function fanCurveLimits(curve: FanCurve): { maxStaticInWc: number; maxFlowCfm: number; minFlowCfm: number } {
  const points = sortedPoints(curve);
  return {
    maxStaticInWc: points[0].staticInWc,
    minFlowCfm: points[0].flowCfm,
    maxFlowCfm: points[points.length - 1].flowCfm,
  };
}

/**
 * Fan static pressure (in. WC) at a flow, by linear interpolation between published points.
 * Outside the published range it holds the end value rather than extrapolate the
 * manufacturer's data.
 */
export function fanStaticAt(curve: FanCurve, flowCfm: number): number {
  const points = sortedPoints(curve);
  if (flowCfm <= points[0].flowCfm) return points[0].staticInWc;
  for (let i = 1; i < points.length; i += 1) {
    const right = points[i];
    if (flowCfm <= right.flowCfm) {
      const left = points[i - 1];
      const t = (flowCfm - left.flowCfm) / (right.flowCfm - left.flowCfm);
      return left.staticInWc + t * (right.staticInWc - left.staticInWc);
    }
  }
  return points[points.length - 1].staticInWc;
}

export interface OperatingPoint {
  flowCfm: number;
  staticInWc: number;
}

/**
 * Where the fan curve meets a rising system curve, by bisection over the published flow
 * range (the difference fan − system is monotone there, so the root is unique). Returns
 * null when they do not meet inside the published range: the system needs more than the
 * fan's highest static pressure, or would pass more than the highest published flow.
 */
export function operatingPoint(curve: FanCurve, systemLossInWc: (flowCfm: number) => number): OperatingPoint | null {
  const { minFlowCfm, maxFlowCfm } = fanCurveLimits(curve);
  const gap = (flowCfm: number) => fanStaticAt(curve, flowCfm) - systemLossInWc(flowCfm);
  let low = minFlowCfm;
  let high = maxFlowCfm;
  const gapLow = gap(low);
  const gapHigh = gap(high);
  if (gapLow < 0 || gapHigh > 0) return null;
  if (gapLow === 0) return { flowCfm: low, staticInWc: fanStaticAt(curve, low) };
  for (let i = 0; i < 200 && high - low > 1e-9 * maxFlowCfm; i += 1) {
    const mid = (low + high) / 2;
    if (gap(mid) > 0) low = mid;
    else high = mid;
  }
  const flowCfm = (low + high) / 2;
  return { flowCfm, staticInWc: fanStaticAt(curve, flowCfm) };
}

export interface MeasuredFlowEstimate {
  flowCfm: number;
  /** Loss in the pipe run at that flow, in. WC. */
  pipeLossInWc: number;
  /** The fan's static pressure at that flow, in. WC (= vacuum + pipe loss). */
  fanStaticInWc: number;
}

/**
 * Estimates airflow from a manometer reading: the fan's static pressure at Q equals the
 * measured vacuum plus the pipe loss at Q between the manometer tap and the discharge
 * (`lengthFt` and `elbows` describe that run, both sides of the fan). Returns null when no
 * flow on the published curve matches — the reading exceeds what the fan can make, or is so
 * low the flow would be beyond the curve — which `diagnoseVacuum` reports as out of range.
 */
export function flowFromMeasuredVacuum(input: PipeRun & { curve: FanCurve; vacuumInWc: number }): MeasuredFlowEstimate | null {
  const { curve, vacuumInWc, nominalSizeIn, lengthFt, elbows } = input;
  const pipeLoss = pipeLossCurveInWc({ nominalSizeIn, lengthFt, elbows });
  const point = operatingPoint(curve, (flowCfm) => vacuumInWc + pipeLoss(flowCfm));
  if (point === null) return null;
  return { flowCfm: point.flowCfm, pipeLossInWc: pipeLoss(point.flowCfm), fanStaticInWc: point.staticInWc };
}

/**
 * Common practice (follows from the fan curve): a standard fan on a slab with a good gravel
 * bed reads well under 2 in. WC.
 */
export const GOOD_GRAVEL_BED_MAX_VACUUM_IN_WC = 2;
/** Common practice: "near the fan's maximum static pressure" = at least 80 % of it. */
export const STARVED_VACUUM_FRACTION_OF_MAX_STATIC = 0.8;
/** Common practice: "little flow" = at most 25 % of the fan's highest published flow. */
export const STARVED_FLOW_FRACTION_OF_MAX_FLOW = 0.25;
/** Common practice: "very low reading" = at most 15 % of the fan's maximum static pressure. */
export const LEAKY_VACUUM_FRACTION_OF_MAX_STATIC = 0.15;
/** Common practice: "high flow" = at least 60 % of the fan's highest published flow. */
export const LEAKY_FLOW_FRACTION_OF_MAX_FLOW = 0.6;
/**
 * Common practice: readings up to 5 % above the published maximum are within manometer and
 * fan-to-fan variation; beyond that the reading or the chosen curve is wrong.
 */
export const MAX_STATIC_TOLERANCE_FRACTION = 0.05;

export type VacuumDiagnosisKind = 'starved' | 'leaky' | 'typical' | 'out_of_range';

export interface VacuumDiagnosis {
  kind: VacuumDiagnosisKind;
  message: string;
  basis: string;
}

const COMMON_PRACTICE_BASIS =
  "Common practice, following from the fan curve; thresholds are fractions of this fan's published curve.";

/**
 * Reads a manometer vacuum against the fan's curve and the (estimated or measured) flow.
 * `flowCfm` null means no flow on the curve matched the reading (see `flowFromMeasuredVacuum`).
 */
export function diagnoseVacuum(input: { curve: FanCurve; vacuumInWc: number; flowCfm: number | null }): VacuumDiagnosis {
  const { curve, vacuumInWc, flowCfm } = input;
  const { maxStaticInWc, maxFlowCfm } = fanCurveLimits(curve);

  if (!(vacuumInWc > 0)) {
    return {
      kind: 'out_of_range',
      message: 'No vacuum: the fan may be off, or the manometer tubing disconnected or blocked. Call for service.',
      basis: 'ANSI/AARST CCAH-2020 Exhibit 2: a gauge reading zero calls for service.',
    };
  }
  if (vacuumInWc > maxStaticInWc * (1 + MAX_STATIC_TOLERANCE_FRACTION) || flowCfm === null) {
    return {
      kind: 'out_of_range',
      message:
        "The reading does not fit this fan's curve: check the manometer, that the fan is running, and that the right fan model was recorded.",
      basis: COMMON_PRACTICE_BASIS,
    };
  }
  if (
    vacuumInWc >= STARVED_VACUUM_FRACTION_OF_MAX_STATIC * maxStaticInWc &&
    flowCfm <= STARVED_FLOW_FRACTION_OF_MAX_FLOW * maxFlowCfm
  ) {
    return {
      kind: 'starved',
      message:
        'Near the fan’s maximum suction with little flow: the suction point is starved (tight or disconnected sub-slab, e.g. a separate pad). Consider a larger suction pit, another suction point, or one in a different slab section.',
      basis: COMMON_PRACTICE_BASIS,
    };
  }
  if (
    vacuumInWc <= LEAKY_VACUUM_FRACTION_OF_MAX_STATIC * maxStaticInWc &&
    flowCfm >= LEAKY_FLOW_FRACTION_OF_MAX_FLOW * maxFlowCfm
  ) {
    return {
      kind: 'leaky',
      message:
        'Very low vacuum with high flow: the system is likely drawing through large openings or leaks (e.g. a tub-drain cutout, slab joints, sump). Find and seal them, then re-check the pressure field.',
      basis: COMMON_PRACTICE_BASIS,
    };
  }
  const tightNote =
    vacuumInWc >= GOOD_GRAVEL_BED_MAX_VACUUM_IN_WC
      ? ` The reading is at or above ${GOOD_GRAVEL_BED_MAX_VACUUM_IN_WC} in. WC, higher than a good gravel bed usually gives: confirm the pressure field reaches the slab edges.`
      : '';
  return {
    kind: 'typical',
    message: `Vacuum and flow are within the fan's normal working range.${tightNote}`,
    basis: COMMON_PRACTICE_BASIS,
  };
}
