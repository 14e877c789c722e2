import { describe, expect, it } from 'vitest';
import { OUTCOME_LABELS, deriveOutcome, isFailure, isSampled, type OutcomeTest, type OutcomeVisit } from './outcome';

// EPA action level 4 pCi/L × 37 = 148 Bq/m³ (EPA Citizen's Guide; curie definition).
const ACTION = 148;

const visit = (overrides: Partial<OutcomeVisit> = {}): OutcomeVisit => ({
  visitedOn: '2024-05-01',
  status: 'completed',
  reworkNeeded: false,
  reworkDone: false,
  ...overrides,
});

const post = (resultBqM3: number, endedAt = '2024-05-05T10:00:00Z', group: string | null = null): OutcomeTest => ({
  kind: 'post',
  startedAt: '2024-05-03T10:00:00Z',
  endedAt,
  resultBqM3,
  sideBySideGroup: group,
});

describe('deriveOutcome', () => {
  it('is not visited without visits', () => {
    expect(deriveOutcome({ visits: [], tests: [], actionLevelBqM3: ACTION })).toBe('not_visited');
  });

  it('is declined when every visit was declined or had no access', () => {
    const visits = [visit({ status: 'declined' }), visit({ status: 'no_access', visitedOn: '2024-06-01' })];
    expect(deriveOutcome({ visits, tests: [], actionLevelBqM3: ACTION })).toBe('declined');
  });

  it('awaits a test after a completed activation', () => {
    expect(deriveOutcome({ visits: [visit()], tests: [], actionLevelBqM3: ACTION })).toBe('awaiting_test');
  });

  it('ignores pre-mitigation tests when deciding the outcome', () => {
    const pre: OutcomeTest = { ...post(400), kind: 'pre' };
    expect(deriveOutcome({ visits: [visit()], tests: [pre], actionLevelBqM3: ACTION })).toBe('awaiting_test');
  });

  it('needs rework when the technician flagged rework that was not done', () => {
    const visits = [visit({ reworkNeeded: true })];
    expect(deriveOutcome({ visits, tests: [post(20)], actionLevelBqM3: ACTION })).toBe('needs_rework');
  });

  it('is below the action level when the latest post test is below it', () => {
    // EPA Citizen's Guide: below 4 pCi/L (148 Bq/m³) needs no fix.
    expect(deriveOutcome({ visits: [visit()], tests: [post(40)], actionLevelBqM3: ACTION })).toBe('below_action_level');
  });

  it('needs rework when the latest post test is at the action level', () => {
    // EPA Citizen's Guide: fix at 4 pCi/L or more.
    expect(deriveOutcome({ visits: [visit()], tests: [post(148)], actionLevelBqM3: ACTION })).toBe('needs_rework');
  });

  it('uses the average of side-by-side devices', () => {
    // ANSI/AARST MAH-2019 §7.2.1: (140 + 160) / 2 = 150 ≥ 148.
    const tests = [post(140, undefined, 's'), post(160, undefined, 's')];
    expect(deriveOutcome({ visits: [visit()], tests, actionLevelBqM3: ACTION })).toBe('needs_rework');
  });

  it('uses the latest post test by end time', () => {
    const tests = [post(40, '2024-06-10T00:00:00Z'), post(300, '2024-05-05T00:00:00Z')];
    expect(deriveOutcome({ visits: [visit()], tests, actionLevelBqM3: ACTION })).toBe('below_action_level');
  });

  it('is reworked and below after rework and a passing test', () => {
    const visits = [visit({ reworkNeeded: true }), visit({ visitedOn: '2024-06-01', reworkNeeded: true, reworkDone: true })];
    const tests = [post(300), post(30, '2024-06-05T00:00:00Z')];
    expect(deriveOutcome({ visits, tests, actionLevelBqM3: ACTION })).toBe('reworked_below');
  });

  it('awaits a new test after rework instead of trusting the failing test from before it', () => {
    const visits = [visit(), visit({ visitedOn: '2024-06-01', reworkNeeded: true, reworkDone: true })];
    expect(deriveOutcome({ visits, tests: [post(300)], actionLevelBqM3: ACTION })).toBe('awaiting_test');
  });

  it('follows the company action level (WHO 100 Bq/m³)', () => {
    // WHO Handbook on Indoor Radon (2009): reference level 100 Bq/m³.
    expect(deriveOutcome({ visits: [visit()], tests: [post(120)], actionLevelBqM3: 100 })).toBe('needs_rework');
  });

  it('has a plain-English label for every outcome', () => {
    expect(Object.keys(OUTCOME_LABELS).sort()).toEqual(
      ['awaiting_test', 'below_action_level', 'declined', 'needs_rework', 'not_visited', 'reworked_below'],
    );
  });
});

describe('isFailure and isSampled', () => {
  it('counts rework needed or done as a failure even after a passing test', () => {
    const visits = [visit({ reworkNeeded: true, reworkDone: true })];
    expect(isFailure({ visits, tests: [post(20)], actionLevelBqM3: ACTION })).toBe(true);
  });

  it('counts any post result at or above the action level as a failure', () => {
    // EPA Citizen's Guide: ≥ 4 pCi/L.
    const tests = [post(200, '2024-05-05T00:00:00Z'), post(20, '2024-06-05T00:00:00Z')];
    expect(isFailure({ visits: [visit()], tests, actionLevelBqM3: ACTION })).toBe(true);
  });

  it('is not a failure when activated and below', () => {
    expect(isFailure({ visits: [visit()], tests: [post(20)], actionLevelBqM3: ACTION })).toBe(false);
  });

  it('does not count unvisited or declined homes as sampled or failed', () => {
    const declined = { visits: [visit({ status: 'declined' })], tests: [post(400)], actionLevelBqM3: ACTION };
    expect(isSampled(declined)).toBe(false);
    expect(isFailure(declined)).toBe(false);
    expect(isSampled({ visits: [visit()] })).toBe(true);
  });
});
