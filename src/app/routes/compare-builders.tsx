import { useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { ErrorNote } from '@/components/ui/error-note';
import { EmptyState } from '@/components/ui/empty-state';
import { Button } from '@/components/ui/button';
import { useBuilders } from '@/features/builders/api/get-builders';
import { useCommunities } from '@/features/communities/api/get-communities';
import { useSettings } from '@/features/settings/api/settings';
import { useBuilderComparison } from '@/features/insight/api/get-builder-comparison';
import { ComparisonChart } from '@/features/insight/components/comparison-chart';
import { ComparisonTable } from '@/features/insight/components/comparison-table';
import { ComparisonFilters } from '@/features/insight/components/comparison-filters';
import { PoolingPanel } from '@/features/insight/components/backtest-panel';
import { comparisonCsv } from '@/features/insight/utils/export';
import { downloadText } from '@/features/insight/utils/csv';
import type { BuilderComparisonQuery } from '@shared/schemas/insight';

export function CompareBuildersRoute() {
  const [params, setParams] = useSearchParams();
  const filters = useMemo<BuilderComparisonQuery>(() => {
    const num = (k: string) => (params.get(k) ? Number(params.get(k)) : undefined);
    return {
      builderId: params.get('builderId') ?? undefined,
      communityId: params.get('communityId') ?? undefined,
      yearFrom: num('yearFrom'),
      yearTo: num('yearTo'),
    };
  }, [params]);
  const builders = useBuilders();
  const communities = useCommunities();
  const settings = useSettings();
  const comparison = useBuilderComparison(filters);
  const radonUnit = settings.data?.settings.radonUnit ?? 'pCi/L';
  const data = comparison.data;

  const update = (patch: Record<string, string | undefined>) =>
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const [k, v] of Object.entries(patch)) {
          if (v) next.set(k, v);
          else next.delete(k);
        }
        return next;
      },
      { replace: true },
    );

  return (
    <Page
      title="Compare builders"
      actions={
        <Button variant="secondary" disabled={!data?.rows.length} onClick={() => data && downloadText('builder-comparison.csv', comparisonCsv(data.rows, radonUnit))}>
          Export CSV
        </Button>
      }
    >
      <div className="flex flex-col gap-4">
        <ComparisonFilters filters={filters} builders={builders.data?.builders ?? []} communities={communities.data?.communities ?? []} onChange={update} />
        {comparison.error && <ErrorNote error={comparison.error} />}
        {comparison.isPending && <p className="text-muted">Counting sampled homes…</p>}
        {data && (
          <>
            <p className="text-sm text-muted">
              {data.method.failure} {data.method.interval}
            </p>
            {data.rows.length === 0 ? (
              <EmptyState title="No homes match these filters">Widen the filters, or import addresses and record visits to start comparing builders.</EmptyState>
            ) : (
              <>
                <PanelBoundary>
                  <ComparisonChart rows={data.rows} />
                </PanelBoundary>
                <p className="text-sm text-muted">Click a construction year to see those homes on the map.</p>
                <ComparisonTable rows={data.rows} radonUnit={radonUnit} />
              </>
            )}
            <PanelBoundary>
              <PoolingPanel data={data} />
            </PanelBoundary>
          </>
        )}
      </div>
    </Page>
  );
}
