import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { BuildersPanel } from '@/features/builders/components/builders-panel';
import { useSession } from '@/features/auth/api/get-session';
import { SURVEY_EDITOR_ROLES } from '@shared/schemas/enums';

export function BuildersRoute() {
  const role = useSession().data?.user?.role;
  return (
    <Page title="Builders">
      <PanelBoundary>
        <BuildersPanel canEdit={Boolean(role && SURVEY_EDITOR_ROLES.includes(role))} />
      </PanelBoundary>
    </Page>
  );
}
