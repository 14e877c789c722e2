import type { ReactNode } from 'react';

/** A labelled input; the input child gets the shared look. Units sit beside the value, not only in the label. */
export function Field({ label, hint, unit, error, children }: { label: string; hint?: string; unit?: string; error?: string; children: ReactNode }) {
  return (
    <label className="flex flex-col gap-1 text-sm">
      <span className="font-medium text-ink">{label}</span>
      <span className="flex items-center gap-2 [&>input]:min-h-11 [&>input]:w-full [&>input]:rounded-md [&>input]:border [&>input]:border-rule [&>input]:bg-panel [&>input]:px-3 [&>select]:min-h-11 [&>select]:w-full [&>select]:rounded-md [&>select]:border [&>select]:border-rule [&>select]:bg-panel [&>select]:px-3 [&>textarea]:w-full [&>textarea]:rounded-md [&>textarea]:border [&>textarea]:border-rule [&>textarea]:bg-panel [&>textarea]:p-3">
        {children}
        {unit && <span className="whitespace-nowrap text-muted">{unit}</span>}
      </span>
      {hint && <span className="text-xs text-muted">{hint}</span>}
      {error && <span className="text-xs text-state-bad">{error}</span>}
    </label>
  );
}
