import { useState, type FormEvent } from 'react';
import { useSettings, useUpdateSettings } from '../api/settings';
import { bqM3ToPciL, pciLToBqM3 } from '@shared/domain/units';
import { Field } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ErrorNote } from '@/components/ui/error-note';

export function SettingsForm() {
  const { data, error } = useSettings();
  if (error) return <ErrorNote error={error} />;
  if (!data) return <p className="text-muted">Loading settings…</p>;
  return <SettingsFormLoaded key={JSON.stringify(data.settings)} settings={data.settings} />;
}

function SettingsFormLoaded({ settings }: { settings: NonNullable<ReturnType<typeof useSettings>['data']>['settings'] }) {
  const update = useUpdateSettings();
  const [actionPciL, setActionPciL] = useState(String(Math.round(bqM3ToPciL(settings.actionLevelBqM3) * 100) / 100));
  const [activation, setActivation] = useState(String(settings.activationPriceCents / 100));
  const [rework, setRework] = useState(String(settings.reworkPriceCents / 100));
  const [unit, setUnit] = useState(settings.radonUnit);

  function submit(e: FormEvent) {
    e.preventDefault();
    update.mutate({
      actionLevelBqM3: pciLToBqM3(Number(actionPciL)),
      activationPriceCents: Math.round(Number(activation) * 100),
      reworkPriceCents: Math.round(Number(rework) * 100),
      radonUnit: unit,
    });
  }

  return (
    <form onSubmit={submit} className="grid gap-4 rounded-md border border-rule bg-panel p-4 sm:grid-cols-2" aria-label="Company settings">
      <Field label="Action level" unit="pCi/L" hint="EPA action level: 4 pCi/L (148 Bq/m³). WHO reference level: 100 Bq/m³ (2.7 pCi/L).">
        <input inputMode="decimal" value={actionPciL} onChange={(e) => setActionPciL(e.target.value)} />
      </Field>
      <Field label="Show radon results in">
        <select value={unit} onChange={(e) => setUnit(e.target.value as typeof unit)}>
          <option value="pCi/L">pCi/L</option>
          <option value="Bq/m3">Bq/m³</option>
        </select>
      </Field>
      <Field label="Activation price per home" unit="USD">
        <input inputMode="decimal" value={activation} onChange={(e) => setActivation(e.target.value)} />
      </Field>
      <Field label="Rework price per home" unit="USD">
        <input inputMode="decimal" value={rework} onChange={(e) => setRework(e.target.value)} />
      </Field>
      {update.error && <div className="sm:col-span-2"><ErrorNote error={update.error} /></div>}
      {update.isSuccess && <p className="text-sm text-state-good sm:col-span-2">Saved.</p>}
      <div className="sm:col-span-2">
        <Button type="submit" disabled={update.isPending}>Save settings</Button>
      </div>
    </form>
  );
}
