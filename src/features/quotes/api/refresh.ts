import type { QueryClient } from '@tanstack/react-query';
import type { QuoteDto } from '@shared/schemas/quotes';
import { quoteQueryOptions, quotesQueryOptions } from './get-quotes';

/** After any change to a quote: store the new state and refresh the list. */
export function refreshQuote(queryClient: QueryClient, quote: QuoteDto) {
  queryClient.setQueryData(quoteQueryOptions(quote.id).queryKey, { quote });
  void queryClient.invalidateQueries({ queryKey: quotesQueryOptions().queryKey });
  void queryClient.invalidateQueries({ queryKey: ['mail', 'outbox'] });
}
