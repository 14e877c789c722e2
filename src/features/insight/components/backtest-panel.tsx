import type { BuilderComparisonDto } from '@shared/schemas/insight';
import { percent } from '../utils/format';

/** The pooling method in words, raw and pooled community estimates side by side, and the back-test. */
export function PoolingPanel({ data }: { data: BuilderComparisonDto }) {
  const { backtest } = data;
  return (
    <section aria-labelledby="pooling-heading" className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4 text-sm">
      <h2 id="pooling-heading" className="text-base font-semibold">Borrowing strength between communities</h2>
      <p data-testid="pooling-method">{data.method.pooling}</p>
      <div className="overflow-x-auto">
        <table className="data w-full text-left tabular">
          <thead>
            <tr className="border-b border-rule">
              <th className="p-2">Builder</th>
              <th className="p-2">Community</th>
              <th className="p-2 text-right">Sampled</th>
              <th className="p-2 text-right">Failures</th>
              <th className="p-2 text-right">Raw rate</th>
              <th className="p-2 text-right">Pooled rate (95 %)</th>
            </tr>
          </thead>
          <tbody>
            {data.communities.map((c) => (
              <tr key={`${c.builderId}|${c.communityId}`} className="border-b border-rule/60">
                <td className="p-2">{c.builderName}</td>
                <td className="p-2">{c.communityName ?? 'No community'}</td>
                <td className="p-2 text-right">{c.sampled}</td>
                <td className="p-2 text-right">{c.failures}</td>
                <td className="p-2 text-right">{c.sampled ? `${percent(c.wilson.rate)} (${percent(c.wilson.lower)}–${percent(c.wilson.upper)})` : '—'}</td>
                <td className="p-2 text-right">{`${percent(c.pooled.rate)} (${percent(c.pooled.lower)}–${percent(c.pooled.upper)})`}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div data-testid="backtest">
        <h3 className="font-medium">Back-test: hold out each community, predict it from the rest</h3>
        <p className="mt-1">{backtest.verdict}</p>
        {backtest.groupsScored > 0 && (
          <p className="mt-1 text-muted tabular">
            {backtest.groupsScored} communities scored · mean error with {backtest.seen} homes seen: raw {percent(backtest.meanErrorRaw, 1)}, pooled {percent(backtest.meanErrorPooled, 1)} · with none seen (the rest alone): {percent(backtest.meanErrorRestOnly, 1)} (percentage points).
          </p>
        )}
      </div>
    </section>
  );
}
