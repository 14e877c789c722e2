import { deriveOutcome, isFailure, isSampled, type OutcomeTest, type OutcomeVisit } from '../../../shared/domain/outcome.js';
import { averageSideBySide } from '../../../shared/domain/radon-tests.js';

export interface SummaryVisit extends OutcomeVisit {
  vacuumPa: number | null;
  reworkReasons?: readonly string[] | null;
}

export interface HomeSummary {
  outcome: ReturnType<typeof deriveOutcome>;
  lastVacuumPa: number | null;
  lastPostBqM3: number | null;
  reworkFlag: boolean;
  /** Every rework reason the completed visits cited, distinct and sorted. */
  reworkReasons: string[];
  sampled: boolean;
  failed: boolean;
}

/**
 * Everything the map and the statistics read about a home's visits and tests, derived in one place
 * (never typed by hand) and stored on the home so tiles and aggregates need no joins.
 */
export function summariseHome(visits: SummaryVisit[], tests: OutcomeTest[], actionLevelBqM3: number): HomeSummary {
  const input = { visits, tests, actionLevelBqM3 };
  const completed = visits.filter((v) => v.status === 'completed').sort((a, b) => a.visitedOn.localeCompare(b.visitedOn));
  const lastVacuum = [...completed].reverse().find((v) => v.vacuumPa != null)?.vacuumPa ?? null;
  const posts = averageSideBySide(tests.filter((t) => t.kind === 'post'));
  return {
    outcome: deriveOutcome(input),
    lastVacuumPa: lastVacuum,
    lastPostBqM3: posts.length ? posts[posts.length - 1].resultBqM3 : null,
    reworkFlag: completed.some((v) => v.reworkNeeded || v.reworkDone),
    reworkReasons: [...new Set(completed.flatMap((v) => v.reworkReasons ?? []))].sort(),
    sampled: isSampled(input),
    failed: isFailure(input),
  };
}
