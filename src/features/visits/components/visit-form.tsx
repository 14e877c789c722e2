import { useMemo, useRef, useState, type FormEvent } from 'react';
import { REWORK_REASONS } from '@shared/schemas/enums';
import { PRESSURE_UNITS, type FanDto } from '@shared/schemas/visits';
import { DEFAULT_PFE_TARGET_PA } from '@shared/domain/pressure-field';
import { Field } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { ErrorNote } from '@/components/ui/error-note';
import { newId } from '@/lib/ids';
import { useQueueVisit } from '../api/save-visit';
import { computeDiagnostics } from '../utils/diagnostics';
import { draftToBody, holesInPa, newDraft, parseDecimal, type FieldErrors, type HoleDraft, type PressureUnit, type ReworkReason, type VisitDraft } from '../utils/visit-draft';
import { FieldCaution } from './field-cautions';
import { PhotoPicker, type PickedPhoto } from './photo-picker';
import { VisitDiagnostics } from './visit-diagnostics';

const LAST_FAN_KEY = 'tractwise.visit.lastFanId';

const STATUS_OPTIONS = [
  { value: 'completed', label: 'Visit done' },
  { value: 'declined', label: 'Declined' },
  { value: 'no_access', label: 'No access' },
] as const;
const PIPE_OPTIONS = [
  { value: '3', label: '3"' },
  { value: '4', label: '4"' },
] as const;
const SUB_SLAB_OPTIONS = [
  { value: 'clean_gravel', label: 'Clean gravel' },
  { value: 'mixed', label: 'Mixed fill' },
  { value: 'none', label: 'No gravel' },
  { value: 'unknown', label: 'Not seen' },
] as const;
const REWORK_LABELS: Record<ReworkReason, string> = {
  added_suction_point: 'Added a suction point',
  sealed_opening: 'Sealed an opening (e.g. tub-drain cutout)',
  sealed_joint: 'Sealed a slab joint or crack',
  rerouted_pipe: 'Re-routed the pipe',
  larger_fan: 'Larger fan',
  other: 'Other',
};
const UNIT_LABELS: Record<PressureUnit, string> = { Pa: 'Pa', in_wc: 'in. WC' };

export interface VisitFormProps {
  homeId: string;
  /** The address, for the list of records that could not be sent. */
  homeLabel: string;
  /** The pipe size on record for the home, as the default. */
  pipeSizeIn: number | null;
  /** The company's pressure-field target (settings), Pa. */
  pfeTargetPa?: number;
  /** A radon result for this home is at or above the action level. */
  aboveActionLevel: boolean;
  onSaved(visitId: string): void;
  onCancel(): void;
  /** The company's fans (the device's copy when offline); the route waits for the list before opening the form. */
  fans: FanDto[];
  /** Why the fan list could not be loaded, when there is no copy to show. */
  fansError: unknown;
}

function rememberedFan(fans: FanDto[]): string {
  try {
    const id = localStorage.getItem(LAST_FAN_KEY);
    return id && fans.some((f) => f.id === id) ? id : '';
  } catch {
    return '';
  }
}

export function VisitForm({ homeId, homeLabel, pipeSizeIn, pfeTargetPa, aboveActionLevel, onSaved, onCancel, fans, fansError }: VisitFormProps) {
  // The id is made once, on the device: saving twice or a retry after a lost answer stores one visit.
  const [visitId] = useState(newId);
  const [draft, setDraft] = useState<VisitDraft>(() => newDraft({ now: new Date(), pipeSizeIn, fanId: rememberedFan(fans) }));
  const [photos, setPhotos] = useState<PickedPhoto[]>([]);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [holeUnit, setHoleUnit] = useState<PressureUnit>('Pa');
  const queue = useQueueVisit();
  const formRef = useRef<HTMLFormElement>(null);

  const set = <K extends keyof VisitDraft>(key: K, value: VisitDraft[K]) => setDraft((d) => ({ ...d, [key]: value }));
  const num = (text: string) => {
    const n = parseDecimal(text);
    return n === null || Number.isNaN(n) ? null : n;
  };
  const fan = fans.find((f) => f.id === draft.fanId) ?? null;
  const done = draft.status === 'completed';

  const diagnostics = useMemo(
    () =>
      computeDiagnostics({
        fan,
        vacuumInWc: num(draft.vacuumInWc),
        pipeSizeIn: draft.pipeSizeIn ? Number(draft.pipeSizeIn) : null,
        pipeLengthFt: num(draft.pipeLengthFt),
        elbows: num(draft.elbows),
        holes: holesInPa(draft.holes),
        targetPa: pfeTargetPa ?? DEFAULT_PFE_TARGET_PA,
      }),
    [fan, draft.vacuumInWc, draft.pipeSizeIn, draft.pipeLengthFt, draft.elbows, draft.holes, pfeTargetPa],
  );

  function setHole(key: string, patch: Partial<HoleDraft>) {
    setDraft((d) => ({ ...d, holes: d.holes.map((h) => (h.key === key ? { ...h, ...patch } : h)) }));
    if (patch.unit) setHoleUnit(patch.unit);
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    const result = draftToBody(visitId, draft);
    if (result.errors) {
      setErrors(result.errors);
      const first = Object.keys(result.errors)[0];
      formRef.current?.querySelector<HTMLElement>(`[name="${first}"]`)?.focus();
      return;
    }
    setErrors({});
    queue.mutate(
      { homeId, homeLabel, visit: result.body, photos: photos.map((p) => ({ id: p.id, file: p.file, subject: p.subject })) },
      {
        onSuccess: () => {
          try {
            if (result.body.fanId) localStorage.setItem(LAST_FAN_KEY, result.body.fanId);
          } catch {
            /* remembering the fan is a convenience */
          }
          onSaved(visitId);
        },
      },
    );
  }

  const errorCount = Object.keys(errors).length;

  return (
    <form ref={formRef} onSubmit={submit} noValidate aria-label="Record a visit" className="flex flex-col gap-6 pb-4">
      <section className="flex flex-col gap-4">
        <Field label="Date" error={errors.visitedOn}>
          <input name="visitedOn" type="date" value={draft.visitedOn} onChange={(e) => set('visitedOn', e.target.value)} required />
        </Field>
        <ChoiceGroup legend="Visit" name="status" value={draft.status} options={STATUS_OPTIONS} onChange={(v) => set('status', v)} error={errors.status} />
      </section>

      {done && (
        <>
          <section className="flex flex-col gap-4" aria-labelledby="fan-heading">
            <h2 id="fan-heading" className="text-lg font-semibold">Fan</h2>
            {fansError != null && <ErrorNote error={fansError} />}
            <Field label="Fan" error={errors.fanId} hint={fans.length === 0 ? 'No fans on the company list yet: an admin adds them with their curves.' : undefined}>
              <select name="fanId" value={draft.fanId} onChange={(e) => set('fanId', e.target.value)}>
                <option value="">No fan installed</option>
                {fans.map((f) => (
                  <option key={f.id} value={f.id}>
                    {f.name} (max {f.maxStaticInWc.toFixed(1)} in. WC)
                  </option>
                ))}
              </select>
            </Field>
            <FieldCaution topic="electrical" />
            <Field label="Fan location" error={errors.fanLocation}>
              <input name="fanLocation" value={draft.fanLocation} onChange={(e) => set('fanLocation', e.target.value)} placeholder="e.g. garage attic" autoComplete="off" />
            </Field>
            <FieldCaution topic="heights" />
            {draft.fanId && (
              <>
                <Field label="Fan switched on at" error={errors.fanActivatedAt} hint="A post-mitigation test starts at least 24 h after this.">
                  <input name="fanActivatedAt" type="datetime-local" value={draft.fanActivatedAt} onChange={(e) => set('fanActivatedAt', e.target.value)} />
                </Field>
                <FieldCaution topic="backdraft" />
              </>
            )}
          </section>

          <section className="flex flex-col gap-4" aria-labelledby="readings-heading">
            <h2 id="readings-heading" className="text-lg font-semibold">Manometer</h2>
            <Field label="Manometer vacuum" unit="in. WC" error={errors.vacuumInWc} hint="As read, without the minus sign.">
              <input name="vacuumInWc" inputMode="decimal" enterKeyHint="next" autoComplete="off" value={draft.vacuumInWc} onChange={(e) => set('vacuumInWc', e.target.value)} />
            </Field>
            <Field label="Later reading (optional)" unit="in. WC" error={errors.laterVacuumInWc} hint="A second reading before you leave, once the system has settled.">
              <input name="laterVacuumInWc" inputMode="decimal" enterKeyHint="next" autoComplete="off" value={draft.laterVacuumInWc} onChange={(e) => set('laterVacuumInWc', e.target.value)} />
            </Field>
          </section>

          <section className="flex flex-col gap-4" aria-labelledby="pipe-heading">
            <h2 id="pipe-heading" className="text-lg font-semibold">Pipe</h2>
            <ChoiceGroup legend="Pipe size" name="pipeSizeIn" value={draft.pipeSizeIn} options={PIPE_OPTIONS} onChange={(v) => set('pipeSizeIn', v)} error={errors.pipeSizeIn} />
            <div className="grid grid-cols-2 gap-3">
              <Field label="Pipe length" unit="ft" error={errors.pipeLengthFt}>
                <input name="pipeLengthFt" inputMode="decimal" enterKeyHint="next" autoComplete="off" value={draft.pipeLengthFt} onChange={(e) => set('pipeLengthFt', e.target.value)} />
              </Field>
              <Field label="Elbows" unit="90°" error={errors.elbows}>
                <input name="elbows" inputMode="numeric" enterKeyHint="next" autoComplete="off" value={draft.elbows} onChange={(e) => set('elbows', e.target.value)} />
              </Field>
            </div>
            <p className="-mt-2 text-xs text-muted">The whole run from the slab to the discharge; two 45° fittings count as one elbow.</p>
            <Field label="Where the pipe enters the slab" error={errors.pipeEntry}>
              <input name="pipeEntry" value={draft.pipeEntry} onChange={(e) => set('pipeEntry', e.target.value)} placeholder="e.g. utility room, by the water heater" autoComplete="off" />
            </Field>
            <FieldCaution topic="discharge" />
            <ChoiceGroup legend="Sub-slab material at the suction point" name="subSlabMaterial" value={draft.subSlabMaterial} options={SUB_SLAB_OPTIONS} onChange={(v) => set('subSlabMaterial', v)} error={errors.subSlabMaterial} />
          </section>

          <section className="flex flex-col gap-3" aria-labelledby="pfe-heading">
            <h2 id="pfe-heading" className="text-lg font-semibold">Pressure field test holes</h2>
            {draft.holes.length === 0 && <p className="text-sm text-muted">Add a row for each test hole you drilled.</p>}
            {draft.holes.map((h, i) => (
              <fieldset key={h.key} className="flex flex-col gap-2 rounded-md border border-rule bg-panel p-3">
                <legend className="px-1 text-sm font-medium">Test hole {i + 1}</legend>
                <div className="grid grid-cols-2 gap-3">
                  <Field label="Distance from the suction point" unit="ft" error={errors[`pressureField.${i}.distanceFt`]}>
                    <input name={`pressureField.${i}.distanceFt`} inputMode="decimal" autoComplete="off" value={h.distanceFt} onChange={(e) => setHole(h.key, { distanceFt: e.target.value })} />
                  </Field>
                  <Field label="Differential" error={errors[`pressureField.${i}.differential`]}>
                    <input name={`pressureField.${i}.differential`} inputMode="decimal" autoComplete="off" value={h.differential} onChange={(e) => setHole(h.key, { differential: e.target.value })} />
                    <select aria-label={`Unit of test hole ${i + 1}`} className="w-auto!" value={h.unit} onChange={(e) => setHole(h.key, { unit: e.target.value as PressureUnit })}>
                      {PRESSURE_UNITS.map((u) => (
                        <option key={u} value={u}>{UNIT_LABELS[u]}</option>
                      ))}
                    </select>
                  </Field>
                </div>
                <button
                  type="button"
                  className="min-h-11 self-start rounded-md border border-rule px-3 text-sm"
                  onClick={() => setDraft((d) => ({ ...d, holes: d.holes.filter((x) => x.key !== h.key) }))}
                >
                  Remove test hole {i + 1}
                </button>
              </fieldset>
            ))}
            <Button
              type="button"
              variant="secondary"
              className="self-start"
              onClick={() => setDraft((d) => ({ ...d, holes: [...d.holes, { key: newId(), distanceFt: '', differential: '', unit: holeUnit }] }))}
            >
              Add a test hole
            </Button>
          </section>

          <VisitDiagnostics diagnostics={diagnostics} />
        </>
      )}

      <section className="flex flex-col gap-3" aria-labelledby="rework-heading">
        <h2 id="rework-heading" className="text-lg font-semibold">Rework</h2>
        <div className="flex flex-wrap gap-2">
          <Check label="Rework needed" checked={draft.reworkNeeded} onChange={(v) => set('reworkNeeded', v)} />
          <Check label="Rework done" checked={draft.reworkDone} onChange={(v) => set('reworkDone', v)} />
        </div>
        {(draft.reworkNeeded || draft.reworkDone) && (
          <fieldset className="flex flex-col gap-2">
            <legend className="mb-1 text-sm font-medium">Why</legend>
            {REWORK_REASONS.map((r) => (
              <Check
                key={r}
                label={REWORK_LABELS[r]}
                checked={draft.reworkReasons.includes(r)}
                onChange={(v) => set('reworkReasons', v ? [...draft.reworkReasons, r] : draft.reworkReasons.filter((x) => x !== r))}
              />
            ))}
            {draft.reworkReasons.includes('other') && (
              <Field label="What other rework" error={errors.otherRework}>
                <input name="otherRework" value={draft.otherRework} onChange={(e) => set('otherRework', e.target.value)} autoComplete="off" />
              </Field>
            )}
          </fieldset>
        )}
      </section>

      <section className="flex flex-col gap-3" aria-labelledby="photos-heading">
        <h2 id="photos-heading" className="text-lg font-semibold">Photos</h2>
        <PhotoPicker photos={photos} onChange={setPhotos} />
      </section>

      <Field label="Notes" error={errors.notes}>
        <textarea name="notes" rows={4} value={draft.notes} onChange={(e) => set('notes', e.target.value)} />
      </Field>

      {aboveActionLevel && <FieldCaution topic="action_level" />}

      <div className="sticky bottom-0 -mx-4 flex flex-col gap-2 border-t border-rule bg-paper/95 px-4 py-3 backdrop-blur">
        {errorCount > 0 && (
          <p role="alert" className="text-sm text-state-bad">
            Check {errorCount === 1 ? 'the field' : `the ${errorCount} fields`} marked below the inputs{errors.form ? `: ${errors.form}` : ''}.
          </p>
        )}
        {queue.error && <ErrorNote error={new Error(`The visit could not be kept on this device: ${queue.error.message}`)} />}
        <div className="flex gap-2">
          <Button type="submit" className="flex-1" disabled={queue.isPending || queue.isSuccess}>
            Save visit
          </Button>
          <Button type="button" variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        </div>
        <p className="text-xs text-muted">Saved on this device first, then sent as soon as there is a connection.</p>
      </div>
    </form>
  );
}

function Check({ label, checked, onChange }: { label: string; checked: boolean; onChange(checked: boolean): void }) {
  return (
    <label className="flex min-h-11 cursor-pointer items-center gap-3 rounded-md border border-rule bg-panel px-3 text-sm has-[:checked]:border-accent">
      <input type="checkbox" className="h-5 w-5 accent-accent" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      {label}
    </label>
  );
}
