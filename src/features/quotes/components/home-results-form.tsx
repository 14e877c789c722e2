import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ErrorNote } from '@/components/ui/error-note';
import { Field } from '@/components/ui/field';
import { useHomeSearch } from '../api/search-homes';
import { useEmailHomeResults } from '../api/email-home-results';

/** A homeowner asks for their own home's results: pick the home, type their e-mail, send. */
export function HomeResultsForm() {
  const [q, setQ] = useState('');
  const [homeId, setHomeId] = useState('');
  const [email, setEmail] = useState('');
  const homes = useHomeSearch(q);
  const send = useEmailHomeResults();
  const chosen = homes.data?.homes.find((h) => h.id === homeId);
  return (
    <form
      aria-label="E-mail a homeowner their results"
      className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4"
      onSubmit={(e) => {
        e.preventDefault();
        send.mutate({ homeId, recipientEmail: email.trim() });
      }}
    >
      <h2 className="text-base font-semibold">E-mail a homeowner their results</h2>
      <Field label="Address">
        <input value={q} onChange={(e) => { setQ(e.target.value); setHomeId(''); send.reset(); }} placeholder="e.g. 1298 Cedar" autoComplete="off" />
      </Field>
      {homes.data && q.trim().length >= 2 && (
        <Field label="Home">
          <select value={homeId} onChange={(e) => setHomeId(e.target.value)} required>
            <option value="">{homes.data.homes.length ? 'Choose the home' : 'No home matches'}</option>
            {homes.data.homes.map((h) => (
              <option key={h.id} value={h.id} disabled={h.doNotContact}>{h.address}{h.doNotContact ? ' (do not contact)' : ''}</option>
            ))}
          </select>
        </Field>
      )}
      <Field label="Homeowner's e-mail" hint="Only this home's own results are sent.">
        <input type="email" value={email} onChange={(e) => setEmail(e.target.value)} required autoComplete="off" />
      </Field>
      {send.error && <ErrorNote error={send.error} />}
      {send.isSuccess && <p role="status" className="text-sm text-state-good">Sent to {email} for {chosen?.address ?? 'the home'}.</p>}
      <Button type="submit" disabled={!homeId || !email || send.isPending}>{send.isPending ? 'Sending…' : 'Send the results'}</Button>
    </form>
  );
}
