import { FanBody, type FanDto } from '@shared/schemas/visits';
import { ApiError } from '@/lib/api-client';
import type { FanInput } from '../api/save-fan';

/** A curve point as typed: text, so a half-typed "0." survives re-renders. */
export interface PointDraft {
  key: string;
  flowCfm: string;
  staticInWc: string;
}

export interface FanDraft {
  name: string;
  points: PointDraft[];
}

/** Messages keyed as the API names fields: `name`, `curve`, `curve.2.flowCfm`; anything else under `form`. */
export type FanErrors = Record<string, string>;

export const MAX_POINTS = 30;

let nextKey = 0;
export const newPoint = (flowCfm = '', staticInWc = ''): PointDraft => ({ key: `p${++nextKey}`, flowCfm, staticInWc });

export function fanDraft(fan?: FanDto): FanDraft {
  if (!fan) return { name: '', points: [newPoint(), newPoint(), newPoint(), newPoint()] };
  return { name: fan.name, points: fan.curve.map((p) => newPoint(String(p.flowCfm), String(p.staticInWc))) };
}

/** Reads "1.4" or "1,4"; null when empty, NaN when not a number. */
function parseDecimal(text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  return /^[-+]?(\d+\.?\d*|\.\d+)$/.test(t) ? Number(t) : Number.NaN;
}

const flowRank = (text: string) => {
  const n = parseDecimal(text);
  return n === null || Number.isNaN(n) ? Number.POSITIVE_INFINITY : n;
};

/**
 * Drops empty rows, puts the points in order of flow (unreadable flows last) and checks the result with
 * the schema the server uses. `points` is the order the body is sent in, so error paths such as
 * `curve.1.staticInWc` (from this check or the server's) point at the row shown second.
 */
export function checkFan(draft: FanDraft): { points: PointDraft[]; body: FanInput | null; errors: FanErrors } {
  const points = draft.points
    .filter((p) => p.flowCfm.trim() !== '' || p.staticInWc.trim() !== '')
    .sort((a, b) => {
      const x = flowRank(a.flowCfm);
      const y = flowRank(b.flowCfm);
      return x === y ? 0 : x < y ? -1 : 1;
    });
  const errors: FanErrors = {};
  if (draft.name.trim() === '') errors.name = 'is required';
  const curve = points.map((p, i) => {
    const flowCfm = parseDecimal(p.flowCfm);
    const staticInWc = parseDecimal(p.staticInWc);
    if (flowCfm === null || Number.isNaN(flowCfm)) errors[`curve.${i}.flowCfm`] = flowCfm === null ? 'is required' : 'must be a number';
    if (staticInWc === null || Number.isNaN(staticInWc)) errors[`curve.${i}.staticInWc`] = staticInWc === null ? 'is required' : 'must be a number';
    return { flowCfm: flowCfm ?? Number.NaN, staticInWc: staticInWc ?? Number.NaN };
  });
  if (Object.keys(errors).length > 0) return { points, body: null, errors };

  const body = { name: draft.name, curve };
  const parsed = FanBody.safeParse(body);
  if (parsed.success) return { points, body, errors };
  for (const issue of parsed.error.issues) errors[issue.path.join('.') || 'form'] ??= issue.message;
  return { points, body: null, errors };
}

/** The server's field messages keyed like `checkFan`'s, so they show beside the same inputs. */
export function serverErrors(error: unknown, pointCount: number): FanErrors {
  if (!(error instanceof ApiError) || error.fields.length === 0) return {};
  const errors: FanErrors = {};
  const unplaced: string[] = [];
  for (const { field, message } of error.fields) {
    const row = /^curve\.(\d+)\.(flowCfm|staticInWc)$/.exec(field);
    if (field === 'name' || field === 'curve' || (row !== null && Number(row[1]) < pointCount)) errors[field] ??= message;
    else unplaced.push(`${field}: ${message}`);
  }
  if (unplaced.length > 0) errors.form = unplaced.join('; ');
  return errors;
}
