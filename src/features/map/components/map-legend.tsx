import { useMemo } from 'react';
import { OUTCOMES } from '@shared/schemas/enums';
import { OUTCOME_LABELS } from '@shared/domain/outcome';
import { iconDataUrl } from '../utils/outcome-icons';
import { postRamp, VACUUM_BREAKS_IN_WC, VACUUM_RAMP, type MapStyleMode } from '../layers/home-layers';

function Ramp({ colours, labels, breakAt }: { colours: readonly string[]; labels: string[]; breakAt?: number }) {
  return (
    <ul className="flex flex-col gap-1">
      {colours.map((c, i) => (
        <li key={c} className={`flex items-center gap-2 ${breakAt === i ? 'mt-1 border-t-2 border-ink pt-1' : ''}`}>
          <span className="h-3.5 w-3.5 flex-none rounded-full border border-ink" style={{ background: c, borderWidth: breakAt !== undefined && i >= breakAt ? 2.5 : 1 }} />
          <span className="tabular">{labels[i]}</span>
        </li>
      ))}
    </ul>
  );
}

export function MapLegend({ styleMode, actionLevelPciL }: { styleMode: MapStyleMode; actionLevelPciL: number }) {
  const icons = useMemo(() => Object.fromEntries([...OUTCOMES].map((o) => [o, iconDataUrl(o)])), []);
  return (
    <section aria-label="Legend" className="rounded-md border border-rule bg-panel/95 p-3 text-xs shadow-sm">
      {styleMode === 'outcome' && (
        <ul className="flex flex-col gap-1">
          {OUTCOMES.map((o) => (
            <li key={o} className="flex items-center gap-2">
              <img src={icons[o]} alt="" className="h-4 w-4" />
              {OUTCOME_LABELS[o]}
            </li>
          ))}
        </ul>
      )}
      {styleMode === 'vacuum' && (
        <>
          <p className="mb-1 font-medium">Manometer vacuum (latest)</p>
          <Ramp
            colours={VACUUM_RAMP}
            labels={VACUUM_RAMP.map((_, i) =>
              i === 0 ? `under ${VACUUM_BREAKS_IN_WC[0]} in. WC` : i === VACUUM_RAMP.length - 1 ? `${VACUUM_BREAKS_IN_WC[i - 1]} in. WC and up` : `${VACUUM_BREAKS_IN_WC[i - 1]}–${VACUUM_BREAKS_IN_WC[i]} in. WC`,
            )}
          />
        </>
      )}
      {styleMode === 'post' && (() => {
        const { breaks, colours } = postRamp(actionLevelPciL);
        const fmt = (v: number) => `${Math.round(v * 10) / 10}`;
        return (
          <>
            <p className="mb-1 font-medium">Post-mitigation level (latest)</p>
            <Ramp
              colours={colours}
              breakAt={3}
              labels={colours.map((_, i) =>
                i === 0 ? `under ${fmt(breaks[0])} pCi/L` : i === colours.length - 1 ? `${fmt(breaks[i - 1])} pCi/L and up` : `${fmt(breaks[i - 1])}–${fmt(breaks[i])} pCi/L`,
              )}
            />
            <p className="mt-1 text-muted">Line and thick ring: action level {fmt(actionLevelPciL)} pCi/L</p>
          </>
        );
      })()}
      {styleMode === 'rework' && (
        <ul className="flex flex-col gap-1">
          <li className="flex items-center gap-2"><img src={icons.needs_rework} alt="" className="h-4 w-4" /> Rework needed or done</li>
          <li className="flex items-center gap-2"><img src={icons.below_action_level} alt="" className="h-4 w-4" /> Activation alone was enough</li>
        </ul>
      )}
    </section>
  );
}
