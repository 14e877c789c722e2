import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { ImportWizard } from '@/features/imports/components/import-wizard';
import { ImportHistory } from '@/features/imports/components/import-history';

export function ImportsRoute() {
  return (
    <Page title="Import addresses">
      <div className="flex flex-col gap-8">
        <PanelBoundary>
          <ImportWizard />
        </PanelBoundary>
        <section aria-label="Past imports" className="flex flex-col gap-2">
          <h2 className="font-semibold">Past imports</h2>
          <PanelBoundary>
            <ImportHistory />
          </PanelBoundary>
        </section>
      </div>
    </Page>
  );
}
