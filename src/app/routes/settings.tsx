import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { SettingsForm } from '@/features/settings/components/settings-form';
import { UsersPanel } from '@/features/settings/components/users-panel';
import { FansPanel } from '@/features/fans/components/fans-panel';

export function SettingsRoute() {
  return (
    <Page title="Company settings, people and fans">
      <div className="flex flex-col gap-8">
        <section>
          <h2 className="mb-2 font-semibold">Thresholds and prices</h2>
          <PanelBoundary><SettingsForm /></PanelBoundary>
        </section>
        <section>
          <h2 className="mb-2 font-semibold">People and roles</h2>
          <PanelBoundary><UsersPanel /></PanelBoundary>
        </section>
        <section>
          <h2 className="mb-2 font-semibold">Fans and their curves</h2>
          <PanelBoundary><FansPanel /></PanelBoundary>
        </section>
      </div>
    </Page>
  );
}
