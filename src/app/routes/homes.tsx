import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { HomesTable } from '@/features/homes/components/homes-table';

export function HomesRoute() {
  return (
    <Page title="Find a home">
      <PanelBoundary>
        <HomesTable />
      </PanelBoundary>
    </Page>
  );
}
