import type { ReactNode } from 'react';

/** A short, specific caution placed where the risk is (DESIGN.md): neutral panel, icon, no modal. */
export function Caution({ title, children }: { title: string; children: ReactNode }) {
  return (
    <aside className="flex gap-3 rounded-md border border-rule bg-panel p-3 text-sm" aria-label={`Caution: ${title}`}>
      <svg aria-hidden viewBox="0 0 24 24" className="mt-0.5 h-5 w-5 flex-none" fill="none" stroke="#1E2630" strokeWidth="2">
        <path d="M12 3 L22 20 H2 Z" strokeLinejoin="round" />
        <path d="M12 10 v4 M12 17 v.5" strokeLinecap="round" />
      </svg>
      <div>
        <p className="font-medium">{title}</p>
        <div className="text-muted">{children}</div>
      </div>
    </aside>
  );
}
