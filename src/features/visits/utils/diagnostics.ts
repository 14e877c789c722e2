// What the visit form's diagnostics panel shows, computed from the readings with the shared domain
// functions. Every line is either a value or the reason it cannot be computed yet.
import type { MultiPolygon, Polygon } from 'geojson';
import type { FanDto } from '@shared/schemas/visits';
import {
  diagnoseVacuum,
  fanCurveLimits,
  fanStaticAt,
  flowFromMeasuredVacuum,
  operatingPoint,
  pipeLossCurveInWc,
  type FanCurve,
  type PipeNominalSizeIn,
  type VacuumDiagnosis,
} from '@shared/domain/pipe-diagnostics';
import { fitPressureField, footprintCoverage, radiusForTargetFt, type FootprintCoverage, type PressureFieldFit } from '@shared/domain/pressure-field';

export type Line<T> = { ok: true; value: T } | { ok: false; reason: string };

const value = <T,>(v: T): Line<T> => ({ ok: true, value: v });
const missing = <T,>(reason: string): Line<T> => ({ ok: false, reason });

export interface DiagnosticsInput {
  fan: FanDto | null;
  vacuumInWc: number | null;
  pipeSizeIn: number | null;
  pipeLengthFt: number | null;
  elbows: number | null;
  /** Test-hole readings already in pascals. */
  holes: { distanceFt: number; differentialPa: number }[];
  /** The company's target differential at the edge of the field (settings), Pa. */
  targetPa: number;
  /** The slab outline and the suction point, when the home has them on record. */
  footprint?: { polygon: Polygon | MultiPolygon; suctionPoint: [number, number] } | null;
}

export interface Diagnostics {
  /** Where this fan's curve meets the pipe's own curve: the most the fan can move through this pipe. */
  pipeOnly: Line<{ flowCfm: number; pipeLossInWc: number }>;
  /** The airflow that makes the fan's static pressure equal the reading plus the pipe loss. */
  measured: Line<{ flowCfm: number; pipeLossInWc: number; fanStaticInWc: number }>;
  hint: Line<VacuumDiagnosis>;
  field: Line<{ fit: PressureFieldFit; radiusFt: number | null; targetPa: number }>;
  coverage: Line<FootprintCoverage>;
}

const valid = (n: number | null): n is number => n !== null && Number.isFinite(n) && n >= 0;

export function computeDiagnostics(input: DiagnosticsInput): Diagnostics {
  const { fan, vacuumInWc, pipeSizeIn, pipeLengthFt, elbows, holes, targetPa, footprint } = input;
  let curve: FanCurve | null = null;
  let curveProblem = 'Choose the fan to compare the readings with its curve.';
  if (fan) {
    try {
      fanCurveLimits({ points: fan.curve });
      curve = { points: fan.curve };
    } catch (err) {
      curveProblem = `This fan's curve cannot be used: ${(err as Error).message}.`;
    }
  }
  const run =
    (pipeSizeIn === 3 || pipeSizeIn === 4) && valid(pipeLengthFt) && valid(elbows)
      ? { nominalSizeIn: pipeSizeIn as PipeNominalSizeIn, lengthFt: pipeLengthFt, elbows }
      : null;
  const runProblem = 'Enter the pipe size, length and number of elbows.';

  let pipeOnly: Diagnostics['pipeOnly'];
  if (!curve) pipeOnly = missing(curveProblem);
  else if (!run) pipeOnly = missing(runProblem);
  else {
    const loss = pipeLossCurveInWc(run);
    const point = operatingPoint(curve, loss);
    if (point) pipeOnly = value({ flowCfm: point.flowCfm, pipeLossInWc: loss(point.flowCfm) });
    else {
      const { maxFlowCfm } = fanCurveLimits(curve);
      pipeOnly =
        fanStaticAt(curve, maxFlowCfm) > loss(maxFlowCfm)
          ? missing(`Through this pipe alone the fan would pass more than its highest published flow (${maxFlowCfm.toFixed(0)} CFM): the pipe is not what limits the flow.`)
          : missing("This pipe needs more than the fan's highest static pressure at any published flow.");
    }
  }

  let measured: Diagnostics['measured'];
  let hint: Diagnostics['hint'];
  if (!curve) {
    measured = missing(curveProblem);
    hint = missing(curveProblem);
  } else if (!valid(vacuumInWc)) {
    measured = missing('Enter the manometer vacuum.');
    hint = missing('Enter the manometer vacuum.');
  } else if (!run) {
    measured = missing(runProblem);
    hint = missing(runProblem);
  } else {
    const estimate = vacuumInWc > 0 ? flowFromMeasuredVacuum({ ...run, curve, vacuumInWc }) : null;
    measured = estimate
      ? value(estimate)
      : missing(vacuumInWc > 0 ? "No flow on this fan's curve matches the reading." : 'A reading of zero gives no flow.');
    hint = value(diagnoseVacuum({ curve, vacuumInWc, flowCfm: estimate?.flowCfm ?? null }));
  }

  let field: Diagnostics['field'];
  const usable = holes.filter((h) => h.differentialPa > 0 && Number.isFinite(h.distanceFt));
  const fit = fitPressureField(holes);
  if (!fit) {
    field = missing(
      usable.length < 2
        ? 'Enter at least two test holes with a differential above zero.'
        : 'The test holes need at least two different distances from the suction point.',
    );
  } else {
    field = value({ fit, radiusFt: radiusForTargetFt(fit, targetPa), targetPa });
  }

  let coverage: Diagnostics['coverage'];
  if (!footprint) coverage = missing('No slab footprint is on record for this home.');
  else if (!field.ok) coverage = missing(field.reason);
  else if (field.value.radiusFt === null) coverage = missing('The readings do not fall off with distance, so no radius can be read from them.');
  else coverage = value(footprintCoverage({ suctionPoint: footprint.suctionPoint, radiusFt: field.value.radiusFt, footprint: footprint.polygon }));

  return { pipeOnly, measured, hint, field, coverage };
}
