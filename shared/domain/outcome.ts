// The outcome of a home is derived from its visits and radon tests, never typed in by hand
// (PRODUCT.md, domain model), so the map, statistics and quotes can never disagree with
// the records they summarise.

import { averageSideBySide } from './radon-tests';

export type HomeOutcome =
  | 'not_visited'
  | 'awaiting_test'
  | 'below_action_level'
  | 'needs_rework'
  | 'reworked_below'
  | 'declined';

export interface OutcomeVisit {
  /** ISO date (YYYY-MM-DD) or date-time. */
  visitedOn: string;
  status: 'completed' | 'declined' | 'no_access';
  reworkNeeded: boolean;
  reworkDone: boolean;
}

export interface OutcomeTest {
  kind: 'pre' | 'post';
  startedAt: string;
  endedAt: string;
  resultBqM3: number;
  sideBySideGroup?: string | null;
}

export interface OutcomeInput {
  visits: readonly OutcomeVisit[];
  tests: readonly OutcomeTest[];
  actionLevelBqM3: number;
}

/** Plain-English labels for the map legend, filters and reports. */
export const OUTCOME_LABELS: Record<HomeOutcome, string> = {
  not_visited: 'Not yet visited',
  awaiting_test: 'Activated, waiting for a post-mitigation test',
  below_action_level: 'Activated and below the action level',
  needs_rework: 'Above the action level or needs rework',
  reworked_below: 'Reworked and below the action level',
  declined: 'Declined or no access',
};

function timeOf(iso: string): number {
  const ms = Date.parse(iso);
  if (Number.isNaN(ms)) throw new RangeError(`Not a valid ISO 8601 date: ${iso}`);
  return ms;
}

function completedVisitsInOrder(visits: readonly OutcomeVisit[]): OutcomeVisit[] {
  return visits
    .filter((v) => v.status === 'completed')
    .sort((a, b) => timeOf(a.visitedOn) - timeOf(b.visitedOn));
}

/**
 * Derives a home's outcome.
 * - No visits → not_visited; only declined / no-access visits → declined.
 * - The latest completed visit left rework needed and not done → needs_rework (a later
 *   visit supersedes an earlier one, so finished rework clears the flag).
 * - Otherwise the latest post-mitigation result (side-by-side devices averaged, MAH-2019
 *   §7.2.1, latest by end time) decides: ≥ action level → needs_rework; below →
 *   reworked_below if any completed visit did rework, else below_action_level.
 * - Only post tests ending on or after the latest completed visit's date count: a result
 *   measured before rework describes the system as it was, not as it is.
 * - Completed but no such post test yet → awaiting_test.
 */
export function deriveOutcome(input: OutcomeInput): HomeOutcome {
  const { visits, tests, actionLevelBqM3 } = input;
  if (visits.length === 0) return 'not_visited';
  const completed = completedVisitsInOrder(visits);
  if (completed.length === 0) return 'declined';

  const latestVisit = completed[completed.length - 1];
  if (latestVisit.reworkNeeded && !latestVisit.reworkDone) return 'needs_rework';

  const latestVisitMs = timeOf(latestVisit.visitedOn);
  const postResults = averageSideBySide(tests.filter((t) => t.kind === 'post')).filter(
    (t) => timeOf(t.endedAt) >= latestVisitMs,
  );
  if (postResults.length === 0) return 'awaiting_test';

  // averageSideBySide orders by end time, so the last entry is the latest result.
  const latest = postResults[postResults.length - 1];
  if (latest.resultBqM3 >= actionLevelBqM3) return 'needs_rework';
  return completed.some((v) => v.reworkDone) ? 'reworked_below' : 'below_action_level';
}

/**
 * True when a home counts as sampled for community statistics: at least one completed
 * activation visit.
 */
export function isSampled(input: Pick<OutcomeInput, 'visits'>): boolean {
  return input.visits.some((v) => v.status === 'completed');
}

/**
 * True when a sampled home counts as a failure for community statistics (PRODUCT.md
 * computation 5): any completed visit needed or did rework, or any post-mitigation result
 * (side-by-side averaged) was at or above the action level. A later good result does not
 * undo a failure: the statistic is about how the builder's passive design behaves.
 */
export function isFailure(input: OutcomeInput): boolean {
  const completed = input.visits.filter((v) => v.status === 'completed');
  if (completed.length === 0) return false;
  if (completed.some((v) => v.reworkNeeded || v.reworkDone)) return true;
  return averageSideBySide(input.tests.filter((t) => t.kind === 'post')).some(
    (t) => t.resultBqM3 >= input.actionLevelBqM3,
  );
}
