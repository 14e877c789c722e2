import type { ReactElement } from 'react';
import type { Outcome } from '@shared/schemas/enums';
import { OUTCOME_LABELS } from '@shared/domain/outcome';

/** Colour and shape both carry the state (DESIGN.md), so colour is never the only cue. */
const SYMBOL: Record<Outcome, ReactElement> = {
  not_visited: <circle cx="8" cy="8" r="4" fill="none" stroke="#8A929C" strokeWidth="2" />,
  awaiting_test: <circle cx="8" cy="8" r="5" fill="none" stroke="#009E73" strokeWidth="2.5" />,
  below_action_level: <circle cx="8" cy="8" r="5.5" fill="#009E73" />,
  needs_rework: <path d="M8 2 L14 13.5 H2 Z" fill="#D55E00" />,
  reworked_below: <circle cx="8" cy="8" r="5" fill="#009E73" stroke="#1E2630" strokeWidth="2" />,
  declined: <rect x="3.5" y="3.5" width="9" height="9" fill="none" stroke="#8A929C" strokeWidth="2" />,
};

export function OutcomeSymbol({ outcome }: { outcome: Outcome }) {
  return (
    <svg viewBox="0 0 16 16" className="h-4 w-4 flex-none" aria-hidden>
      {SYMBOL[outcome]}
    </svg>
  );
}

export function OutcomeBadge({ outcome }: { outcome: Outcome }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap text-sm">
      <OutcomeSymbol outcome={outcome} />
      {OUTCOME_LABELS[outcome]}
    </span>
  );
}
