import { useState } from 'react';
import { Field } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ErrorNote } from '@/components/ui/error-note';
import { useCreateQuote } from '../api/create-quote';

export function QuoteForm({ communities, onCreated }: { communities: { id: string; name: string }[]; onCreated(id: string): void }) {
  const [communityId, setCommunityId] = useState('');
  const [pooled, setPooled] = useState(false);
  const [recipientEmail, setRecipientEmail] = useState('');
  const create = useCreateQuote();
  return (
    <form
      aria-label="New quote"
      className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4"
      onSubmit={(e) => {
        e.preventDefault();
        create.mutate({ communityId, pooled, recipientEmail: recipientEmail.trim() || null }, { onSuccess: ({ quote }) => onCreated(quote.id) });
      }}
    >
      <h2 className="text-base font-semibold">New quote</h2>
      <Field label="Community">
        <select value={communityId} onChange={(e) => setCommunityId(e.target.value)} required>
          <option value="">Choose a community</option>
          {communities.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
        </select>
      </Field>
      <label className="flex min-h-11 items-start gap-2 text-sm">
        <input type="checkbox" className="mt-1" checked={pooled} onChange={(e) => setPooled(e.target.checked)} />
        <span>
          Borrow strength from the builder's other communities (pooled prior)
          <span className="block text-xs text-muted">Off: a uniform Beta(1, 1) prior, so the community's own sampled homes decide. Check the back-test on “Compare builders” first.</span>
        </span>
      </label>
      <Field label="Send to (optional)" hint="The HOA board or property manager; you can add it later.">
        <input type="email" value={recipientEmail} onChange={(e) => setRecipientEmail(e.target.value)} autoComplete="off" />
      </Field>
      {create.error && <ErrorNote error={create.error} />}
      <Button type="submit" disabled={!communityId || create.isPending}>{create.isPending ? 'Pricing…' : 'Price the community'}</Button>
    </form>
  );
}
