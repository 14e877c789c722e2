import { useState } from 'react';
import { Page } from '@/components/layouts/page';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { ErrorNote } from '@/components/ui/error-note';
import { useSession } from '@/features/auth/api/get-session';
import { useCommunities } from '@/features/communities/api/get-communities';
import { useQuotes } from '@/features/quotes/api/get-quotes';
import { QuoteForm } from '@/features/quotes/components/quote-form';
import { QuotesList } from '@/features/quotes/components/quotes-list';
import { QuoteDetail } from '@/features/quotes/components/quote-detail';
import { HomeResultsForm } from '@/features/quotes/components/home-results-form';
import { OutboxList } from '@/features/quotes/components/outbox-list';

export function QuotesRoute() {
  const role = useSession().data?.user?.role;
  const communities = useCommunities();
  const quotes = useQuotes();
  const [selected, setSelected] = useState<string | null>(null);
  const shown = selected ?? quotes.data?.quotes[0]?.id ?? null;
  return (
    <Page title="Quote a community">
      <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
        <div className="flex flex-col gap-4">
          <QuoteForm communities={communities.data?.communities ?? []} onCreated={setSelected} />
          <PanelBoundary>
            <HomeResultsForm />
          </PanelBoundary>
        </div>
        <div className="flex flex-col gap-4">
          {quotes.error && <ErrorNote error={quotes.error} />}
          {quotes.data && <QuotesList quotes={quotes.data.quotes} selectedId={shown} onSelect={setSelected} />}
          {shown && role && (
            <PanelBoundary>
              <QuoteDetail id={shown} role={role} />
            </PanelBoundary>
          )}
          <PanelBoundary>
            <OutboxList />
          </PanelBoundary>
        </div>
      </div>
    </Page>
  );
}
