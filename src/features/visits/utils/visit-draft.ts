// The visit form keeps what the technician typed as text (so "1." or "1,2" survive while typing) and turns
// it into the API's VisitBody only on save, with one message per field.
import { VisitBody, type PRESSURE_UNITS } from '@shared/schemas/visits';
import type { REWORK_REASONS, SUB_SLAB_MATERIALS, VISIT_STATUSES } from '@shared/schemas/enums';
import { inWcToPa } from '@shared/domain/units';

export type PressureUnit = (typeof PRESSURE_UNITS)[number];
export type ReworkReason = (typeof REWORK_REASONS)[number];
export type SubSlabMaterial = (typeof SUB_SLAB_MATERIALS)[number];
export type VisitStatus = (typeof VISIT_STATUSES)[number];

export interface HoleDraft {
  key: string;
  distanceFt: string;
  differential: string;
  unit: PressureUnit;
}

export interface VisitDraft {
  visitedOn: string;
  status: VisitStatus;
  fanId: string;
  fanLocation: string;
  /** `<input type="datetime-local">` value, device time. */
  fanActivatedAt: string;
  vacuumInWc: string;
  laterVacuumInWc: string;
  pipeSizeIn: '' | '3' | '4';
  pipeLengthFt: string;
  elbows: string;
  pipeEntry: string;
  subSlabMaterial: SubSlabMaterial;
  holes: HoleDraft[];
  reworkNeeded: boolean;
  reworkDone: boolean;
  reworkReasons: ReworkReason[];
  /** What the "other" rework was; saved at the top of the notes. */
  otherRework: string;
  notes: string;
}

/** Field name (as the API names it, e.g. `pressureField.0.distanceFt`) → message. */
export type FieldErrors = Record<string, string>;

const pad = (n: number) => String(n).padStart(2, '0');

/** YYYY-MM-DD in the device's time zone (a visit's date is the local calendar day). */
export function localDate(d: Date): string {
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** The value a `datetime-local` input takes, in the device's time zone, to the minute. */
export function localDateTime(d: Date): string {
  return `${localDate(d)}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** A `datetime-local` value read in the device's time zone, as ISO 8601 UTC; null when empty or invalid. */
export function localDateTimeToIso(value: string): string | null {
  if (!value) return null;
  const d = new Date(value);
  return Number.isNaN(d.getTime()) ? null : d.toISOString();
}

/**
 * Reads a number as typed on a phone keypad: empty → null; a decimal comma is accepted; anything else
 * that is not a finite number → NaN (reported as "enter a number").
 */
export function parseDecimal(text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)$/.test(t)) return Number.NaN;
  return Number(t);
}

export function newDraft(opts: { now: Date; pipeSizeIn: number | null; fanId: string }): VisitDraft {
  return {
    visitedOn: localDate(opts.now),
    status: 'completed',
    fanId: opts.fanId,
    fanLocation: '',
    fanActivatedAt: localDateTime(opts.now),
    vacuumInWc: '',
    laterVacuumInWc: '',
    pipeSizeIn: opts.pipeSizeIn === 3 || opts.pipeSizeIn === 4 ? (String(opts.pipeSizeIn) as '3' | '4') : '',
    pipeLengthFt: '',
    elbows: '',
    pipeEntry: '',
    subSlabMaterial: 'unknown',
    holes: [],
    reworkNeeded: false,
    reworkDone: false,
    reworkReasons: [],
    otherRework: '',
    notes: '',
  };
}

/** The test-hole readings in pascals, leaving out rows that are incomplete or not numbers. */
export function holesInPa(holes: readonly HoleDraft[]): { distanceFt: number; differentialPa: number }[] {
  return holes.flatMap((h) => {
    const distanceFt = parseDecimal(h.distanceFt);
    const differential = parseDecimal(h.differential);
    if (distanceFt === null || differential === null || Number.isNaN(distanceFt) || Number.isNaN(differential)) return [];
    return [{ distanceFt, differentialPa: h.unit === 'in_wc' ? inWcToPa(differential) : differential }];
  });
}

/**
 * Turns the form into the API body, validated by the same schema the server uses. A visit that did not
 * happen (declined, no access) carries no fan, readings or pipe.
 */
export function draftToBody(id: string, draft: VisitDraft): { body: VisitBody; errors: null } | { body: null; errors: FieldErrors } {
  const errors: FieldErrors = {};
  const num = (field: string, text: string): number | null => {
    const n = parseDecimal(text);
    if (n !== null && Number.isNaN(n)) errors[field] = 'enter a number';
    return n;
  };
  const done = draft.status === 'completed';
  const vacuumInWc = done ? num('vacuumInWc', draft.vacuumInWc) : null;
  const laterVacuumInWc = done ? num('laterVacuumInWc', draft.laterVacuumInWc) : null;
  const pipeLengthFt = done ? num('pipeLengthFt', draft.pipeLengthFt) : null;
  const elbows = done ? num('elbows', draft.elbows) : null;
  // Rows left completely empty are ignored; `kept` maps the sent rows back to the rows on screen.
  const kept: number[] = [];
  const pressureField = done
    ? draft.holes.flatMap((h, i) => {
        const distanceFt = num(`pressureField.${i}.distanceFt`, h.distanceFt);
        const differential = num(`pressureField.${i}.differential`, h.differential);
        if (distanceFt === null && differential === null) return [];
        if (distanceFt === null) errors[`pressureField.${i}.distanceFt`] ??= 'enter the distance';
        if (differential === null) errors[`pressureField.${i}.differential`] ??= 'enter the differential';
        kept.push(i);
        return [{ distanceFt, differential, unit: h.unit }];
      })
    : [];
  if (elbows !== null && !Number.isNaN(elbows) && !Number.isInteger(elbows)) errors.elbows = 'enter a whole number (two 45° fittings count as one elbow)';
  const rework = draft.reworkNeeded || draft.reworkDone;
  const reasons = rework ? draft.reworkReasons : [];
  const otherNote = reasons.includes('other') ? draft.otherRework.trim() : '';
  if (reasons.includes('other') && !otherNote) errors.otherRework = 'describe the other rework';
  const fanActivatedAt = done && draft.fanId ? localDateTimeToIso(draft.fanActivatedAt) : null;
  if (done && draft.fanId && draft.fanActivatedAt && !fanActivatedAt) errors.fanActivatedAt = 'enter a date and time';
  if (Object.keys(errors).length) return { body: null, errors };

  const parsed = VisitBody.safeParse({
    id,
    visitedOn: draft.visitedOn,
    status: draft.status,
    fanId: done && draft.fanId ? draft.fanId : null,
    fanLocation: done ? draft.fanLocation : '',
    fanActivatedAt,
    vacuumInWc,
    laterVacuumInWc,
    pipeSizeIn: done && draft.pipeSizeIn ? Number(draft.pipeSizeIn) : null,
    pipeLengthFt,
    elbows,
    pipeEntry: done ? draft.pipeEntry : '',
    subSlabMaterial: done ? draft.subSlabMaterial : 'unknown',
    pressureField,
    reworkNeeded: draft.reworkNeeded,
    reworkDone: draft.reworkDone,
    reworkReasons: reasons,
    notes: [otherNote && `Other rework: ${otherNote}`, draft.notes.trim()].filter(Boolean).join('\n\n'),
  });
  if (parsed.success) return { body: parsed.data, errors: null };
  for (const issue of parsed.error.issues) {
    const path = [...issue.path];
    if (path[0] === 'pressureField' && typeof path[1] === 'number') path[1] = kept[path[1]] ?? path[1];
    const field = path.join('.') || 'form';
    errors[field] ??= issue.message;
  }
  return { body: null, errors };
}
