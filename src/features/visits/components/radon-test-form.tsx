import { useId, useMemo, useRef, useState, type FormEvent } from 'react';
import { TEST_DEVICES, TEST_KINDS } from '@shared/schemas/enums';
import { MAX_ATTACHMENT_BYTES, RadonTestBody } from '@shared/schemas/visits';
import { checkPostTestTiming, checkTestDuration, followUpAdvice, type RadonDevice, type RadonTestKind, type RadonWarning } from '@shared/domain/radon-tests';
import { pciLToBqM3, type RadonDisplayUnit } from '@shared/domain/units';
import { Field } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { ErrorNote } from '@/components/ui/error-note';
import { newId } from '@/lib/ids';
import { useQueueRadonTest } from '../api/save-radon-test';
import { localDateTime, localDateTimeToIso, parseDecimal, type FieldErrors } from '../utils/visit-draft';
import { FieldCaution } from './field-cautions';

const KIND_OPTIONS: { value: RadonTestKind; label: string }[] = TEST_KINDS.map((k) => ({ value: k, label: k === 'pre' ? 'Pre-mitigation' : 'Post-mitigation' }));
const DEVICE_LABELS: Record<RadonDevice, string> = {
  continuous_monitor: 'Continuous monitor',
  charcoal: 'Charcoal canister',
  alpha_track: 'Alpha-track detector',
  electret: 'Electret ion chamber',
};
const UNIT_LABELS: Record<RadonDisplayUnit, string> = { 'pCi/L': 'pCi/L', 'Bq/m3': 'Bq/m³' };
const MIB = 1024 * 1024;
const HOUR_MS = 3_600_000;

export interface RadonTestFormProps {
  homeId: string;
  homeLabel: string;
  /** The company's preferred unit: the default for the result. */
  radonUnit: RadonDisplayUnit;
  actionLevelBqM3: number;
  /** When the home's fan was last switched on (ISO), if known: the post-test timing check needs it. */
  fanActivatedAt: string | null;
  defaultKind: RadonTestKind;
  onSaved(testId: string): void;
  onCancel(): void;
}

export function labReportProblem(file: File): string | null {
  if (file.size > MAX_ATTACHMENT_BYTES) return `${file.name} is ${(file.size / MIB).toFixed(1)} MB; a lab report can be at most ${MAX_ATTACHMENT_BYTES / MIB} MB.`;
  if (file.type !== 'application/pdf') return `${file.name} is not a PDF. Attach the lab's report as a PDF.`;
  return null;
}

export function RadonTestForm({ homeId, homeLabel, radonUnit, actionLevelBqM3, fanActivatedAt, defaultKind, onSaved, onCancel }: RadonTestFormProps) {
  const [testId] = useState(newId);
  const [labReportId] = useState(newId);
  const [now] = useState(() => new Date());
  const [kind, setKind] = useState<RadonTestKind>(defaultKind);
  const [device, setDevice] = useState<RadonDevice>('continuous_monitor');
  // Tests are usually recorded when the device is picked up: it ran until now, for the 48 h minimum.
  const [startedAt, setStartedAt] = useState(() => localDateTime(new Date(now.getTime() - 48 * HOUR_MS)));
  const [endedAt, setEndedAt] = useState(() => localDateTime(now));
  const [result, setResult] = useState('');
  const [unit, setUnit] = useState<RadonDisplayUnit>(radonUnit);
  const [group, setGroup] = useState('');
  const [fanAt, setFanAt] = useState(() => (fanActivatedAt ? localDateTime(new Date(fanActivatedAt)) : ''));
  const [labReport, setLabReport] = useState<File | null>(null);
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  const [errors, setErrors] = useState<FieldErrors>({});
  const queue = useQueueRadonTest();
  const formRef = useRef<HTMLFormElement>(null);
  const fileId = useId();

  const startIso = localDateTimeToIso(startedAt);
  const endIso = localDateTimeToIso(endedAt);
  const fanIso = localDateTimeToIso(fanAt);
  const resultValue = parseDecimal(result);
  const resultBqM3 = resultValue === null || Number.isNaN(resultValue) ? null : unit === 'pCi/L' ? pciLToBqM3(resultValue) : resultValue;

  // Practice checks, live and never blocking: the technician may know why a test ran as it did.
  const warnings = useMemo<RadonWarning[]>(() => {
    const list: RadonWarning[] = [];
    if (startIso && endIso) list.push(...checkTestDuration({ kind, device, startedAt: startIso, endedAt: endIso, resultBqM3: resultBqM3 ?? 0 }));
    if (startIso && fanIso) list.push(...checkPostTestTiming({ kind, startedAt: startIso }, fanIso));
    if (kind === 'pre' && resultBqM3 !== null) {
      const advice = followUpAdvice(resultBqM3, actionLevelBqM3);
      if (advice.action !== 'none') list.push({ code: advice.action.toUpperCase(), message: advice.message, source: advice.source });
    }
    return list;
  }, [kind, device, startIso, endIso, fanIso, resultBqM3, actionLevelBqM3]);

  function pickFile(file: File | undefined) {
    if (!file) return;
    const why = labReportProblem(file);
    setFileProblem(why);
    setLabReport(why ? null : file);
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    const found: FieldErrors = {};
    if (!startIso) found.startedAt = 'enter a date and time';
    if (!endIso) found.endedAt = 'enter a date and time';
    if (resultValue === null) found.result = 'enter the result';
    else if (Number.isNaN(resultValue)) found.result = 'enter a number';
    let body: RadonTestBody | null = null;
    if (Object.keys(found).length === 0) {
      const parsed = RadonTestBody.safeParse({
        id: testId,
        visitId: null,
        kind,
        device,
        startedAt: startIso,
        endedAt: endIso,
        result: resultValue,
        unit,
        sideBySideGroup: group.trim() || null,
      });
      if (parsed.success) body = parsed.data;
      else for (const issue of parsed.error.issues) found[issue.path.join('.') || 'form'] ??= issue.message;
    }
    setErrors(found);
    if (!body) {
      formRef.current?.querySelector<HTMLElement>(`[name="${Object.keys(found)[0]}"]`)?.focus();
      return;
    }
    queue.mutate(
      { homeId, homeLabel, test: body, labReport: labReport ? { id: labReportId, file: labReport } : null },
      { onSuccess: () => onSaved(testId) },
    );
  }

  const errorCount = Object.keys(errors).length;

  return (
    <form ref={formRef} onSubmit={submit} noValidate aria-label="Record a radon test" className="flex flex-col gap-5 pb-4">
      <ChoiceGroup<RadonTestKind> legend="Test" name="kind" value={kind} options={KIND_OPTIONS} onChange={setKind} />
      <Field label="Device" error={errors.device}>
        <select name="device" value={device} onChange={(e) => setDevice(e.target.value as RadonDevice)}>
          {TEST_DEVICES.map((d) => (
            <option key={d} value={d}>{DEVICE_LABELS[d]}</option>
          ))}
        </select>
      </Field>
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
        <Field label="Started" error={errors.startedAt}>
          <input name="startedAt" type="datetime-local" value={startedAt} onChange={(e) => setStartedAt(e.target.value)} />
        </Field>
        <Field label="Ended" error={errors.endedAt}>
          <input name="endedAt" type="datetime-local" value={endedAt} onChange={(e) => setEndedAt(e.target.value)} />
        </Field>
      </div>
      <Field label="Result" error={errors.result}>
        <input name="result" inputMode="decimal" autoComplete="off" value={result} onChange={(e) => setResult(e.target.value)} />
        <select aria-label="Result unit" className="w-auto!" value={unit} onChange={(e) => setUnit(e.target.value as RadonDisplayUnit)}>
          {(Object.keys(UNIT_LABELS) as RadonDisplayUnit[]).map((u) => (
            <option key={u} value={u}>{UNIT_LABELS[u]}</option>
          ))}
        </select>
      </Field>
      <Field label="Side-by-side group (optional)" error={errors.sideBySideGroup} hint="Give devices placed side by side the same label; their results are averaged.">
        <input name="sideBySideGroup" value={group} onChange={(e) => setGroup(e.target.value)} placeholder="e.g. A" autoComplete="off" />
      </Field>
      <Field label="Fan switched on at" hint={fanActivatedAt ? 'From the latest visit.' : 'Not on record: enter it to check the post-mitigation timing.'}>
        <input name="fanActivatedAt" type="datetime-local" value={fanAt} onChange={(e) => setFanAt(e.target.value)} />
      </Field>

      {warnings.length > 0 && (
        <section aria-label="Practice checks" className="flex flex-col gap-2 rounded-md border border-caution bg-panel p-3 text-sm">
          <p className="font-medium">Check before saving (you can still save)</p>
          <ul className="flex flex-col gap-2" data-testid="test-warnings">
            {warnings.map((w) => (
              <li key={w.code} className="border-l-4 border-caution pl-2">
                {w.message}
                <span className="block text-xs text-muted">{w.source}</span>
              </li>
            ))}
          </ul>
        </section>
      )}
      {resultBqM3 !== null && resultBqM3 >= actionLevelBqM3 && <FieldCaution topic="action_level" />}

      <div className="flex flex-col gap-2 text-sm">
        <span className="font-medium">Lab report (optional)</span>
        <label htmlFor={fileId} className="flex min-h-11 cursor-pointer items-center justify-center self-start rounded-md border border-accent bg-panel px-4 font-medium text-accent has-[:focus-visible]:outline-2">
          {labReport ? 'Choose another PDF' : 'Attach the lab report (PDF)'}
        </label>
        <input id={fileId} type="file" accept="application/pdf" className="sr-only" onChange={(e) => pickFile(e.target.files?.[0])} />
        {labReport && (
          <p className="flex items-center gap-2">
            <span className="tabular truncate">{labReport.name} · {(labReport.size / MIB).toFixed(1)} MB</span>
            <button type="button" className="min-h-11 rounded-md border border-rule px-3" onClick={() => setLabReport(null)}>Remove</button>
          </p>
        )}
        {fileProblem && <p role="alert" className="text-state-bad">{fileProblem}</p>}
      </div>

      <div className="sticky bottom-0 -mx-4 flex flex-col gap-2 border-t border-rule bg-paper/95 px-4 py-3 backdrop-blur">
        {errorCount > 0 && <p role="alert" className="text-sm text-state-bad">Check {errorCount === 1 ? 'the field' : `the ${errorCount} fields`} marked below the inputs.</p>}
        {queue.error && <ErrorNote error={new Error(`The test could not be kept on this device: ${queue.error.message}`)} />}
        <div className="flex gap-2">
          <Button type="submit" className="flex-1" disabled={queue.isPending || queue.isSuccess}>Save test</Button>
          <Button type="button" variant="secondary" onClick={onCancel}>Cancel</Button>
        </div>
        <p className="text-xs text-muted">Saved on this device first, then sent as soon as there is a connection.</p>
      </div>
    </form>
  );
}
