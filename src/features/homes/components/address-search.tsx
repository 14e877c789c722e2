import { useId, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { getHomes } from '../api/get-homes';
import type { HomeDto } from '@shared/schemas/homes';

/** Address search as an ARIA combobox: arrows move, Enter picks, Escape closes. */
export function AddressSearch({ onPick }: { onPick(home: HomeDto): void }) {
  const [q, setQ] = useState('');
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const listId = useId();
  const term = q.trim();
  // No placeholder data here: Enter must never pick a row left over from an earlier query.
  const { data } = useQuery({
    queryKey: ['homes', 'search', term],
    queryFn: ({ signal }) => getHomes({ q: term, limit: 8 }, signal),
    enabled: term.length >= 2,
  });
  const results = term.length >= 2 ? (data?.homes ?? []) : [];

  function pick(home: HomeDto) {
    onPick(home);
    setQ(home.address);
    setOpen(false);
  }

  return (
    <div className="relative">
      <input
        role="combobox"
        aria-label="Find an address"
        aria-expanded={open && results.length > 0}
        aria-controls={listId}
        aria-activedescendant={open && results[active] ? `${listId}-${active}` : undefined}
        placeholder="Find an address"
        className="min-h-11 w-full rounded-md border border-rule bg-panel px-3 shadow-sm"
        value={q}
        onChange={(e) => {
          setQ(e.target.value);
          setOpen(true);
          setActive(0);
        }}
        onKeyDown={(e) => {
          if (e.key === 'ArrowDown') {
            e.preventDefault();
            setOpen(true);
            setActive((a) => Math.min(a + 1, results.length - 1));
          } else if (e.key === 'ArrowUp') {
            e.preventDefault();
            setActive((a) => Math.max(a - 1, 0));
          } else if (e.key === 'Enter' && results[active]) {
            e.preventDefault();
            pick(results[active]);
          } else if (e.key === 'Escape') {
            setOpen(false);
          }
        }}
      />
      {open && results.length > 0 && (
        <ul id={listId} role="listbox" className="absolute z-10 mt-1 max-h-72 w-full overflow-auto rounded-md border border-rule bg-panel shadow">
          {results.map((h, i) => (
            <li
              key={h.id}
              id={`${listId}-${i}`}
              role="option"
              aria-selected={i === active}
              className={`min-h-11 cursor-pointer px-3 py-2 text-sm ${i === active ? 'bg-accent text-white' : ''}`}
              onMouseDown={(e) => {
                e.preventDefault();
                pick(h);
              }}
            >
              {h.address}
              <span className={`ml-2 ${i === active ? 'text-white/80' : 'text-muted'}`}>{h.communityName ?? ''}</span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
