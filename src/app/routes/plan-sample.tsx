import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useCommunities } from '@/features/communities/api/get-communities';
import { PlanSamplePanel } from '@/features/sampling/components/plan-sample-panel';

export function PlanSampleRoute() {
  const communities = useCommunities();
  return (
    <Page title="Plan a sample">
      <PanelBoundary>
        <PlanSamplePanel communities={communities.data?.communities ?? []} />
      </PanelBoundary>
    </Page>
  );
}
