import { useEffect, useRef } from 'react';
import * as Plot from '@observablehq/plot';
import type { ComparisonRow } from '@shared/schemas/insight';

const INK = '#1E2630';
const BAD = '#D55E00';
const ACCENT = '#0F6E74';

/**
 * Each cell's failure rate as a dot with its Wilson 95 % interval as an error bar, and the pooled
 * estimate as a hollow diamond beside it: with two sampled homes the bar spans most of the axis,
 * so a small sample can never look certain.
 */
export function ComparisonChart({ rows }: { rows: ComparisonRow[] }) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const data = rows.map((r) => ({
      label: `${r.builderName ?? 'Unknown builder'} · ${r.communityName ?? 'no community'} · ${r.yearBuilt ?? '?'}`,
      rate: r.wilson.rate,
      lower: r.wilson.lower,
      upper: r.wilson.upper,
      pooled: r.pooled.rate,
      n: r.sampled,
      k: r.failures,
    }));
    const chart = Plot.plot({
      width: Math.max(560, el.clientWidth),
      height: 40 + data.length * 20,
      marginLeft: 300,
      marginRight: 24,
      style: { fontFamily: 'IBM Plex Sans, system-ui, sans-serif', fontSize: '12px', background: 'transparent', color: INK },
      x: { domain: [0, 100], percent: true, grid: true, label: 'Failure rate (%) · bar = Wilson 95 % interval', labelAnchor: 'left' },
      y: { domain: data.map((d) => d.label), label: null, tickSize: 0 },
      marks: [
        Plot.ruleY(data, { y: 'label', x1: 'lower', x2: 'upper', stroke: INK, strokeWidth: 1.5, strokeOpacity: 0.7 }),
        Plot.tickX(data, { y: 'label', x: 'lower', stroke: INK, strokeOpacity: 0.7 }),
        Plot.tickX(data, { y: 'label', x: 'upper', stroke: INK, strokeOpacity: 0.7 }),
        Plot.dot(data.filter((d) => d.pooled != null), { y: 'label', x: 'pooled', symbol: 'diamond', r: 4.5, stroke: ACCENT, strokeWidth: 1.5, fill: 'white' }),
        Plot.dot(data.filter((d) => d.rate != null), {
          y: 'label',
          x: 'rate',
          symbol: 'triangle',
          r: 4,
          fill: BAD,
          title: (d: (typeof data)[number]) => `${d.label}\n${d.k} of ${d.n} sampled failed`,
        }),
        Plot.ruleX([0]),
      ],
    });
    el.replaceChildren(chart);
    return () => chart.remove();
  }, [rows]);
  return (
    <figure className="rounded-md border border-rule bg-panel p-3" aria-label="Failure rate by builder, community and construction year">
      <div ref={ref} data-testid="comparison-chart" className="overflow-x-auto" />
      <figcaption className="mt-2 flex flex-wrap gap-4 text-xs text-muted">
        <span><span className="text-state-bad">▲</span> raw rate of the sampled homes</span>
        <span>├─┤ Wilson 95 % interval</span>
        <span><span className="text-accent">◇</span> pooled estimate</span>
        <span>Rows with no sampled home show the whole 0–100 % range.</span>
      </figcaption>
    </figure>
  );
}
