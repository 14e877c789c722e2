import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { CommunitiesTable } from '@/features/communities/components/communities-table';
import { useBuilders } from '@/features/builders/api/get-builders';

export function CommunitiesRoute() {
  const builders = useBuilders();
  const names = new Map((builders.data?.builders ?? []).map((b) => [b.id, b.name]));
  return (
    <Page title="Communities">
      <PanelBoundary>
        <CommunitiesTable builderNames={names} />
      </PanelBoundary>
    </Page>
  );
}
