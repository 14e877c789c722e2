import { useEffect, useState } from 'react';
import { removeFromOutbox, retryInOutbox, useOutbox } from '@/lib/outbox';

const ALL_SENT_MS = 4_000;

/**
 * The app shell's view of records kept on this device: how many wait to be sent, a short "All sent" once
 * they went, and the records the server refused, with its reasons, until the user deals with them.
 */
export function OutboxStatus() {
  const outbox = useOutbox();
  const [open, setOpen] = useState(false);
  const [, setTick] = useState(0);
  const waiting = outbox.pending.length;
  const justSent = waiting === 0 && outbox.failed.length === 0 && outbox.lastFlushedAt !== null && Date.now() - outbox.lastFlushedAt < ALL_SENT_MS;

  // Re-render once the "All sent" moment is over.
  useEffect(() => {
    if (!justSent || outbox.lastFlushedAt === null) return;
    const t = setTimeout(() => setTick((n) => n + 1), ALL_SENT_MS - (Date.now() - outbox.lastFlushedAt) + 50);
    return () => clearTimeout(t);
  }, [justSent, outbox.lastFlushedAt]);

  let text = '';
  if (waiting > 0) text = `Waiting to send (${waiting})${outbox.needsSignIn ? ': sign in again to send' : ''}`;
  else if (justSent) text = 'All sent';

  return (
    <div className="relative flex items-center gap-2 text-sm">
      <span
        role="status"
        data-testid="outbox-status"
        title={waiting > 0 && outbox.lastProblem ? `Last try: ${outbox.lastProblem}` : undefined}
        className={text ? `flex min-h-11 items-center gap-1.5 rounded-md border px-2 ${waiting > 0 ? 'border-caution' : 'border-state-good'}` : 'sr-only'}
      >
        {text && (
          <svg aria-hidden viewBox="0 0 16 16" className="h-4 w-4 flex-none" fill="none" stroke="currentColor" strokeWidth="2">
            {waiting > 0 ? <path d="M8 3v6M5 6l3 3 3-3M3 13h10" strokeLinecap="round" /> : <path d="M3 8.5l3 3 7-7" strokeLinecap="round" />}
          </svg>
        )}
        {text}
      </span>
      {outbox.failed.length > 0 && (
        <button
          type="button"
          className="min-h-11 rounded-md border border-state-bad px-2 text-state-bad"
          aria-expanded={open}
          aria-controls="outbox-failed"
          onClick={() => setOpen((o) => !o)}
        >
          Not sent ({outbox.failed.length})
        </button>
      )}
      {open && outbox.failed.length > 0 && (
        <section id="outbox-failed" aria-label="Records not sent" className="absolute right-0 top-12 z-40 w-[min(22rem,90vw)] rounded-md border border-rule bg-panel p-3 shadow-lg">
          <p className="mb-2 text-muted">The server refused these records. They stay on this device until you remove them.</p>
          <ul className="flex flex-col gap-3">
            {outbox.failed.map((item) => (
              <li key={item.id} className="border-t border-rule pt-2">
                <p className="font-medium">{item.label}</p>
                <p className="text-state-bad">{item.failure?.message}</p>
                {item.failure && item.failure.fields.length > 0 && (
                  <ul className="list-disc pl-5 text-muted">
                    {item.failure.fields.map((f) => (
                      <li key={f.field}>
                        <code>{f.field}</code>: {f.message}
                      </li>
                    ))}
                  </ul>
                )}
                <div className="mt-1 flex gap-2">
                  <button type="button" className="min-h-11 rounded-md border border-rule px-3" onClick={() => void retryInOutbox(item.id)}>Try again</button>
                  <button type="button" className="min-h-11 rounded-md border border-rule px-3" onClick={() => void removeFromOutbox(item.id)}>Remove</button>
                </div>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
