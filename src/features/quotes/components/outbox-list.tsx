import { useOutbox } from '../api/get-outbox';

/** Development only: what this server has e-mailed (hidden when the server has no outbox). */
export function OutboxList() {
  const { data } = useOutbox();
  if (!data) return null;
  return (
    <section aria-label="Sent mail (development)" className="rounded-md border border-dashed border-rule p-4 text-sm">
      <h2 className="font-semibold">Sent mail <span className="font-normal text-muted">(development only)</span></h2>
      {data.messages.length === 0 && <p className="text-muted">Nothing sent yet.</p>}
      <ul className="mt-2 flex flex-col gap-1 tabular">
        {data.messages.map((m) => (
          <li key={m.messageId + m.sentAt} className="flex flex-wrap justify-between gap-2 border-b border-rule/60 py-1">
            <span>{m.subject}</span>
            <span className="text-muted">to {m.to.join(', ')} · {m.sentAt.slice(0, 16).replace('T', ' ')}{m.attachments.length ? ` · ${m.attachments.map((a) => a.filename).join(', ')}` : ''}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
