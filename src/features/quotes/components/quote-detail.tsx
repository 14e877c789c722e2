import { useState } from 'react';
import type { Role } from '@shared/schemas/enums';
import { Button } from '@/components/ui/button';
import { Caution } from '@/components/ui/caution';
import { ErrorNote } from '@/components/ui/error-note';
import { Field } from '@/components/ui/field';
import { useQuote } from '../api/get-quotes';
import { useApproveQuote } from '../api/approve-quote';
import { useSendQuote } from '../api/send-quote';
import { useDecideQuote } from '../api/decide-quote';
import { money, STATUS_LABELS, when } from '../utils/format';

const APPROVERS: readonly Role[] = ['admin', 'manager'];

function Figure({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="flex justify-between gap-3 border-b border-rule/60 py-1.5">
      <dt className="text-muted">{label}</dt>
      <dd className="text-right">{children}</dd>
    </div>
  );
}

export function QuoteDetail({ id, role }: { id: string; role: Role }) {
  const { data, error } = useQuote(id);
  const approve = useApproveQuote();
  const send = useSendQuote();
  const decide = useDecideQuote();
  const [recipient, setRecipient] = useState('');
  if (error) return <ErrorNote error={error} />;
  if (!data) return <p className="text-muted">Loading quote…</p>;
  const q = data.quote;
  const pct = Math.round(q.confidence * 100);
  const mutationError = approve.error ?? send.error ?? decide.error;
  return (
    <article aria-label="Quote" className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4">
      <div className="flex flex-wrap items-baseline gap-3">
        <h2 className="text-lg font-semibold">{q.communityName}</h2>
        <span className="rounded-md border border-rule px-2 text-sm" data-testid="quote-status">{STATUS_LABELS[q.status]}</span>
        <a className="ml-auto text-accent underline" href={`/api/quotes/${q.id}/pdf`} target="_blank" rel="noreferrer">Open the PDF</a>
      </div>
      <p className="text-2xl font-semibold tabular" data-testid="quote-range">{money(q.priceExpectedCents)} – {money(q.priceUpperCents)}</p>
      <p className="text-sm text-muted">Expected total – total if rework reaches the {pct} % upper bound.</p>
      <dl className="text-sm tabular">
        <Figure label="Homes">{q.homesTotal}</Figure>
        <Figure label="Sampled · needed rework or stayed above the level">{q.homesSampled} · {q.failuresSampled}</Figure>
        <Figure label="Expected reworks among the unsampled">{q.expectedReworks.toFixed(1)}</Figure>
        <Figure label={`Reworks not exceeded with ${pct} % confidence`}>{q.upperReworks}</Figure>
        <Figure label="Activation · rework price">{money(q.activationPriceCents)} · {money(q.reworkPriceCents)} a home</Figure>
        <Figure label="Per home, all-inclusive">{money(q.perHomeExpectedCents)} expected · {money(q.perHomeUpperCents)} upper</Figure>
        <Figure label="Created">{when(q.createdAt)}{q.createdByName ? ` · ${q.createdByName}` : ''}</Figure>
        <Figure label="Approved">{when(q.approvedAt)}{q.approvedByName ? ` · ${q.approvedByName}` : ''}</Figure>
        <Figure label="Sent">{when(q.sentAt)}{q.recipientEmail ? ` · ${q.recipientEmail}` : ''}</Figure>
        <Figure label="Decided">{when(q.decidedAt)}</Figure>
      </dl>
      <p className="text-xs text-muted">{q.method}</p>
      {mutationError && <ErrorNote error={mutationError} />}
      <div className="flex flex-wrap items-end gap-2">
        {q.status === 'draft' && APPROVERS.includes(role) && (
          <Button onClick={() => approve.mutate(q.id)} disabled={approve.isPending}>Approve</Button>
        )}
        {q.status === 'draft' && !APPROVERS.includes(role) && <p className="text-sm text-muted">A manager approves the quote before it can be sent.</p>}
        {(q.status === 'approved' || q.status === 'sent') && (
          <form
            className="flex flex-wrap items-end gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              send.mutate({ id: q.id, recipientEmail: recipient.trim() || undefined });
            }}
          >
            <Field label="Send to">
              <input type="email" placeholder={q.recipientEmail ?? 'board@example.org'} value={recipient} onChange={(e) => setRecipient(e.target.value)} />
            </Field>
            <Button type="submit" disabled={send.isPending}>{send.isPending ? 'Preparing the PDF and sending…' : q.status === 'sent' ? 'Send again' : 'E-mail the quote'}</Button>
          </form>
        )}
        {q.status === 'sent' && (
          <>
            <Button variant="secondary" onClick={() => decide.mutate({ id: q.id, decision: 'accepted' })}>Accepted</Button>
            <Button variant="danger" onClick={() => decide.mutate({ id: q.id, decision: 'declined' })}>Declined</Button>
          </>
        )}
      </div>
      <Caution title="What the quote promises, and what it defers">
        Fan wiring is electrical work and follows the electrical code; the vent discharges above the roof edge away from windows, doors and air intakes as the standard and local code require;
        check fuel-burning appliances for backdraft after activation; attic and roof work carries fall and heat risks; radon results guide health decisions: retest after changes, and a result above the action level calls for a certified professional.
        Local codes and licensed practice come first.
      </Caution>
    </article>
  );
}
