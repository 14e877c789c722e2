import type { ReactNode } from 'react';
import { paToInWc } from '@shared/domain/units';
import type { Diagnostics, Line } from '../utils/diagnostics';

const inWc = (v: number) => `${v.toFixed(2)} in. WC`;
const pa = (v: number) => `${v < 10 ? v.toFixed(1) : v.toFixed(0)} Pa`;
const cfm = (v: number) => `${v.toFixed(0)} CFM`;

function Row<T>({ label, line, children }: { label: string; line: Line<T>; children(value: T): ReactNode }) {
  return (
    <div className="flex flex-col gap-0.5 border-b border-rule/60 py-2 last:border-b-0">
      <dt className="text-muted">{label}</dt>
      <dd className="tabular">
        {line.ok ? (
          children(line.value)
        ) : (
          <>
            <span aria-hidden>— </span>
            <span className="text-muted">{line.reason}</span>
          </>
        )}
      </dd>
    </div>
  );
}

const HINT_STYLE = { starved: 'border-state-bad', leaky: 'border-state-bad', out_of_range: 'border-caution', typical: 'border-state-good' } as const;

/** The readings read back against the fan's curve and the pipe, recomputed as the technician types. */
export function VisitDiagnostics({ diagnostics }: { diagnostics: Diagnostics }) {
  const { pipeOnly, measured, hint, field, coverage } = diagnostics;
  return (
    <section aria-labelledby="diagnostics-heading" className="rounded-md border border-rule bg-paper p-3 text-sm">
      <h2 id="diagnostics-heading" className="font-semibold">Diagnostics</h2>
      <dl>
        <Row label="Fan on this pipe alone (no sub-slab resistance)" line={pipeOnly}>
          {(v) => (
            <>
              up to {cfm(v.flowCfm)}; pipe loss there {inWc(v.pipeLossInWc)}
            </>
          )}
        </Row>
        <Row label="Airflow implied by the manometer reading" line={measured}>
          {(v) => (
            <>
              about {cfm(v.flowCfm)}; fan at {inWc(v.fanStaticInWc)}, of which the pipe takes {inWc(v.pipeLossInWc)}
            </>
          )}
        </Row>
        <Row label="What the reading suggests" line={hint}>
          {(v) => (
            <span className={`block border-l-4 pl-2 ${HINT_STYLE[v.kind]}`} data-testid="vacuum-hint" data-kind={v.kind}>
              {v.message}
              <span className="block text-xs text-muted">{v.basis}</span>
            </span>
          )}
        </Row>
        <Row label="Pressure field" line={field}>
          {(v) => (
            <>
              {v.radiusFt === null
                ? 'The readings do not fall off with distance, so no radius can be read from them.'
                : v.radiusFt === 0
                  ? `Even at the suction point the fitted field is below the ${pa(v.targetPa)} target.`
                  : `falls below ${pa(v.targetPa)} (${paToInWc(v.targetPa).toFixed(3)} in. WC) at about ${v.radiusFt.toFixed(0)} ft from the suction point`}
              <span className="block text-xs text-muted">
                Exponential fit on {v.fit.n} test holes, r² {v.fit.rSquared.toFixed(2)}
                {v.fit.n > 2 && v.fit.rSquared < 0.8 ? ': the readings scatter, so treat the radius as rough.' : '.'} The target is the company's setting.
              </span>
            </>
          )}
        </Row>
        <Row label="Slab footprint covered" line={coverage}>
          {(v) => (v.fullyCovered ? 'Yes, the whole footprint' : `No: about ${(v.coveredFraction * 100).toFixed(0)} % of the footprint`)}
        </Row>
      </dl>
    </section>
  );
}
