import { useState, type FormEvent } from 'react';
import type { FanDto } from '@shared/schemas/visits';
import { ApiError } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { ErrorNote } from '@/components/ui/error-note';
import { EmptyState } from '@/components/ui/empty-state';
import { useFans } from '../api/get-fans';
import { useSaveFan } from '../api/save-fan';
import { checkFan, fanDraft, MAX_POINTS, newPoint, serverErrors, type FanDraft, type FanErrors, type PointDraft } from '../utils/fan-draft';

const number = (n: number, digits: number) => n.toLocaleString('en-US', { maximumFractionDigits: digits });

/** The company's fan models and their curves, which the visit form's diagnostics read; admins add and correct them here. */
export function FansPanel() {
  const { data, error, isPending } = useFans();
  const [editing, setEditing] = useState<FanDto | null>(null);
  // A new key gives a fresh, empty form after each save.
  const [formKey, setFormKey] = useState(0);
  const [saved, setSaved] = useState<string | null>(null);

  function done(fan?: FanDto) {
    setSaved(fan ? `Saved ${fan.name}.` : null);
    setEditing(null);
    setFormKey((k) => k + 1);
  }

  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_28rem]">
      <div>
        {error && <ErrorNote error={error} />}
        {isPending && <p className="text-muted">Loading fans…</p>}
        {data?.fans.length === 0 && (
          <EmptyState title="No fans yet">Add the fan models your crews install, with their curves, so the visit form can check each manometer reading.</EmptyState>
        )}
        {data && data.fans.length > 0 && (
          <table className="data w-full rounded-md border border-rule bg-panel text-left text-sm" aria-label="Fans">
            <thead>
              <tr className="border-b border-rule">
                <th className="p-2">Fan</th>
                <th className="p-2 text-right">Max static</th>
                <th className="p-2 text-right">Max flow</th>
                <th className="p-2 text-right">Points</th>
                <th className="p-2" />
              </tr>
            </thead>
            <tbody className="tabular">
              {data.fans.map((f) => (
                <tr key={f.id} className="border-b border-rule/60">
                  <td className="p-2 font-medium">{f.name}</td>
                  <td className="p-2 text-right">{number(f.maxStaticInWc, 2)} in. WC</td>
                  <td className="p-2 text-right">{number(Math.max(...f.curve.map((p) => p.flowCfm)), 1)} CFM</td>
                  <td className="p-2 text-right">{f.curve.length}</td>
                  <td className="p-2 text-right">
                    <Button variant="secondary" aria-label={`Edit ${f.name}`} onClick={() => { setSaved(null); setEditing(f); }}>
                      Edit
                    </Button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        {saved && <p role="status" className="mt-2 text-sm text-state-good">{saved}</p>}
      </div>
      <FanForm key={editing ? editing.id : `new-${formKey}`} fan={editing ?? undefined} onSaved={done} onCancel={() => done()} />
    </div>
  );
}

function FanForm({ fan, onSaved, onCancel }: { fan?: FanDto; onSaved(fan: FanDto): void; onCancel(): void }) {
  const save = useSaveFan();
  const [draft, setDraft] = useState<FanDraft>(() => fanDraft(fan));
  const [checked, setChecked] = useState<FanErrors>({});
  const errors: FanErrors = { ...serverErrors(save.error, draft.points.length), ...checked };
  const unexplained = save.error && !(save.error instanceof ApiError && save.error.fields.length > 0);
  const title = fan ? `Edit ${fan.name}` : 'Add a fan';

  const setPoint = (key: string, change: Partial<PointDraft>) =>
    setDraft((d) => ({ ...d, points: d.points.map((p) => (p.key === key ? { ...p, ...change } : p)) }));
  // Adding or removing a row shifts the rows the messages point at: drop them.
  const reshape = (points: PointDraft[]) => {
    setDraft((d) => ({ ...d, points }));
    setChecked({});
    save.reset();
  };

  function submit(e: FormEvent) {
    e.preventDefault();
    const { points, body, errors: found } = checkFan(draft);
    // Saved in order of flow, and shown that way, so the messages' row numbers match the table.
    const shown = [...points];
    while (shown.length < 2) shown.push(newPoint());
    setDraft((d) => ({ ...d, points: shown }));
    setChecked(found);
    save.reset();
    if (body) save.mutate({ id: fan?.id, body }, { onSuccess: (res) => onSaved(res.fan) });
  }

  return (
    <form onSubmit={submit} className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4" aria-label={title}>
      <h2 className="font-semibold">{title}</h2>
      <Field label="Model name" error={errors.name}>
        <input required maxLength={120} autoFocus={Boolean(fan)} value={draft.name} onChange={(e) => setDraft((d) => ({ ...d, name: e.target.value }))} />
      </Field>
      <fieldset className="flex flex-col gap-2" aria-describedby="fan-curve-hint">
        <legend className="mb-1 text-sm font-medium">Curve points</legend>
        <p id="fan-curve-hint" className="text-xs text-muted">
          Copy the points from the maker's data sheet: the airflow at each static pressure, including the no-flow point (the fan's
          maximum static pressure). They are put in order of flow when you save.
        </p>
        <table className="w-full text-sm">
          <thead>
            <tr className="text-left text-xs text-muted">
              <th className="w-6 pb-1 font-normal">#</th>
              <th className="pb-1 font-normal">Airflow</th>
              <th className="pb-1 font-normal">Static pressure</th>
              <th className="pb-1" />
            </tr>
          </thead>
          <tbody className="tabular">
            {draft.points.map((p, i) => {
              const flowError = errors[`curve.${i}.flowCfm`];
              const staticError = errors[`curve.${i}.staticInWc`];
              const rowErrors = [flowError && `airflow: ${flowError}`, staticError && `static pressure: ${staticError}`].filter(Boolean);
              const errorId = `fan-point-${p.key}-error`;
              return [
                <tr key={p.key}>
                  <td className="pr-1 text-muted">{i + 1}</td>
                  <td className="py-1 pr-2">
                    <span className="flex items-center gap-1">
                      <input
                        className="min-h-11 w-full min-w-0 rounded-md border border-rule bg-panel px-3"
                        inputMode="decimal"
                        aria-label={`Point ${i + 1} airflow`}
                        aria-invalid={Boolean(flowError)}
                        aria-describedby={rowErrors.length > 0 ? errorId : undefined}
                        value={p.flowCfm}
                        onChange={(e) => setPoint(p.key, { flowCfm: e.target.value })}
                      />
                      <span className="whitespace-nowrap text-muted">CFM</span>
                    </span>
                  </td>
                  <td className="py-1 pr-2">
                    <span className="flex items-center gap-1">
                      <input
                        className="min-h-11 w-full min-w-0 rounded-md border border-rule bg-panel px-3"
                        inputMode="decimal"
                        aria-label={`Point ${i + 1} static pressure`}
                        aria-invalid={Boolean(staticError)}
                        aria-describedby={rowErrors.length > 0 ? errorId : undefined}
                        value={p.staticInWc}
                        onChange={(e) => setPoint(p.key, { staticInWc: e.target.value })}
                      />
                      <span className="whitespace-nowrap text-muted">in. WC</span>
                    </span>
                  </td>
                  <td className="py-1 text-right">
                    <button
                      type="button"
                      className="min-h-11 min-w-11 rounded-md border border-rule text-muted hover:border-state-bad hover:text-state-bad disabled:opacity-40"
                      aria-label={`Remove point ${i + 1}`}
                      title="Remove this point"
                      disabled={draft.points.length <= 2}
                      onClick={() => reshape(draft.points.filter((q) => q.key !== p.key))}
                    >
                      ✕
                    </button>
                  </td>
                </tr>,
                rowErrors.length > 0 && (
                  <tr key={`${p.key}-error`}>
                    <td />
                    <td colSpan={3} id={errorId} className="pb-1 text-xs text-state-bad">
                      Point {i + 1} {rowErrors.join('; ')}
                    </td>
                  </tr>
                ),
              ];
            })}
          </tbody>
        </table>
        <Button type="button" variant="secondary" disabled={draft.points.length >= MAX_POINTS} onClick={() => reshape([...draft.points, newPoint()])}>
          Add a point
        </Button>
        {errors.curve && <p role="alert" className="text-sm text-state-bad">Curve: {errors.curve}</p>}
      </fieldset>
      {errors.form && <p role="alert" className="text-sm text-state-bad">{errors.form}</p>}
      {unexplained && <ErrorNote error={save.error} />}
      <div className="flex gap-2">
        <Button type="submit" className="flex-1" disabled={save.isPending}>{fan ? 'Save changes' : 'Add fan'}</Button>
        {fan && <Button type="button" variant="secondary" className="flex-1" onClick={onCancel}>Cancel</Button>}
      </div>
    </form>
  );
}
