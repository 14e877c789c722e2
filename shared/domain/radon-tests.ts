// Radon test rules: side-by-side averaging, duration and timing checks, classification
// against the company's action level, and the EPA follow-up rule.
// Results are stored in Bq/m³; the pCi/L constants below are written as 37 × pCi/L.

import { PCI_PER_L_TO_BQ_M3 } from './units';

export type RadonTestKind = 'pre' | 'post';
export type RadonDevice = 'continuous_monitor' | 'charcoal' | 'alpha_track' | 'electret';

export interface RadonTestInput {
  kind: RadonTestKind;
  device: RadonDevice;
  /** ISO 8601 timestamp. */
  startedAt: string;
  /** ISO 8601 timestamp. */
  endedAt: string;
  resultBqM3: number;
  /** Devices placed side by side share a group id and are reported as one averaged result. */
  sideBySideGroup?: string | null;
}

/** A warning shown beside a test; `source` names the standard clause behind it. */
export interface RadonWarning {
  code: string;
  message: string;
  source: string;
}

/** The fields averaging needs; device is optional so outcome code can reuse it. */
export interface SideBySideInput {
  kind: RadonTestKind;
  startedAt: string;
  endedAt: string;
  resultBqM3: number;
  sideBySideGroup?: string | null;
}

/** One reported result: a single device, or the mean of a side-by-side group. */
export interface AveragedRadonTest {
  kind: RadonTestKind;
  startedAt: string;
  endedAt: string;
  resultBqM3: number;
  deviceCount: number;
  sideBySideGroup: string | null;
}

/** EPA action level, 4 pCi/L (EPA, A Citizen's Guide to Radon, 402/K-12/002, 2016). */
export const EPA_ACTION_LEVEL_BQ_M3 = 4 * PCI_PER_L_TO_BQ_M3;

/** Lower end of EPA's "consider fixing" band, 2 pCi/L (EPA, A Citizen's Guide to Radon). */
export const EPA_CONSIDER_LEVEL_BQ_M3 = 2 * PCI_PER_L_TO_BQ_M3;

/** WHO reference level, 100 Bq/m³ (WHO, Handbook on Indoor Radon, 2009). */
export const WHO_REFERENCE_LEVEL_BQ_M3 = 100;

/** Minimum short-term test length (EPA 402-R-92-003 test protocols: at least 48 hours). */
export const SHORT_TERM_MIN_HOURS = 48;

/** Continuous monitors need at least 46 h of data (ANSI/AARST MAH-2019 §8.5.3). */
export const CONTINUOUS_MONITOR_MIN_DATA_HOURS = 46;

/** A test longer than 90 days is a long-term test (EPA 402-R-92-003; Citizen's Guide). */
export const LONG_TERM_MIN_DAYS = 90;

/** Post-mitigation tests start no sooner than 24 h after the fan runs (MAH-2019 §7.3.2). */
export const POST_TEST_MIN_HOURS_AFTER_FAN = 24;

const HOUR_MS = 3_600_000;

function parseTime(iso: string, field: string): number {
  const ms = Date.parse(iso);
  if (Number.isNaN(ms)) throw new RangeError(`${field} is not a valid ISO 8601 time: ${iso}`);
  return ms;
}

/**
 * Averages side-by-side devices into one result per group (ANSI/AARST MAH-2019 §7.2.1:
 * devices placed side by side are reported as their average). Tests without a group stand
 * alone. Groups are keyed by kind as well, so a pre and a post test can never be merged.
 * The result is ordered by end time, then start time.
 */
export function averageSideBySide(tests: readonly SideBySideInput[]): AveragedRadonTest[] {
  const groups = new Map<string, SideBySideInput[]>();
  const singles: AveragedRadonTest[] = [];
  for (const test of tests) {
    const group = test.sideBySideGroup ?? null;
    if (group === null || group === '') {
      singles.push({
        kind: test.kind,
        startedAt: test.startedAt,
        endedAt: test.endedAt,
        resultBqM3: test.resultBqM3,
        deviceCount: 1,
        sideBySideGroup: null,
      });
      continue;
    }
    const key = `${test.kind}\u0000${group}`;
    const members = groups.get(key);
    if (members) members.push(test);
    else groups.set(key, [test]);
  }

  const averaged: AveragedRadonTest[] = [...groups.values()].map((members) => {
    const byStart = [...members].sort((a, b) => parseTime(a.startedAt, 'startedAt') - parseTime(b.startedAt, 'startedAt'));
    const byEnd = [...members].sort((a, b) => parseTime(b.endedAt, 'endedAt') - parseTime(a.endedAt, 'endedAt'));
    const sum = members.reduce((total, t) => total + t.resultBqM3, 0);
    return {
      kind: members[0].kind,
      startedAt: byStart[0].startedAt,
      endedAt: byEnd[0].endedAt,
      resultBqM3: sum / members.length,
      deviceCount: members.length,
      sideBySideGroup: members[0].sideBySideGroup ?? null,
    };
  });

  return [...singles, ...averaged].sort(
    (a, b) =>
      parseTime(a.endedAt, 'endedAt') - parseTime(b.endedAt, 'endedAt') ||
      parseTime(a.startedAt, 'startedAt') - parseTime(b.startedAt, 'startedAt'),
  );
}

/** Hours between a test's start and end (negative when the end precedes the start). */
export function testDurationHours(test: Pick<RadonTestInput, 'startedAt' | 'endedAt'>): number {
  return (parseTime(test.endedAt, 'endedAt') - parseTime(test.startedAt, 'startedAt')) / HOUR_MS;
}

/**
 * Short-term (2–90 days) or long-term (more than 90 days), per EPA 402-R-92-003 and the
 * Citizen's Guide.
 */
export function testTerm(test: Pick<RadonTestInput, 'startedAt' | 'endedAt'>): 'short_term' | 'long_term' {
  return testDurationHours(test) > LONG_TERM_MIN_DAYS * 24 ? 'long_term' : 'short_term';
}

/**
 * Checks a test's length. A continuous monitor is held to the MAH-2019 §8.5.3 rule of 46 h
 * of data (the standard's device-specific rule, so it takes precedence for monitors);
 * integrating devices are held to EPA's 48 h minimum (402-R-92-003).
 * Only the deployment period is known here, so a monitor with gaps may still fall short.
 */
export function checkTestDuration(test: RadonTestInput): RadonWarning[] {
  const hours = testDurationHours(test);
  if (hours <= 0) {
    return [
      {
        code: 'TEST_ENDS_BEFORE_START',
        message: 'The test ends before (or when) it starts: check the dates.',
        source: 'Data check',
      },
    ];
  }
  if (test.device === 'continuous_monitor') {
    if (hours < CONTINUOUS_MONITOR_MIN_DATA_HOURS) {
      return [
        {
          code: 'CONTINUOUS_MONITOR_UNDER_46H',
          message: `The monitor ran ${hours.toFixed(1)} h; a continuous monitor needs at least ${CONTINUOUS_MONITOR_MIN_DATA_HOURS} h of data.`,
          source: 'ANSI/AARST MAH-2019 §8.5.3',
        },
      ];
    }
    return [];
  }
  if (hours < SHORT_TERM_MIN_HOURS) {
    return [
      {
        code: 'SHORT_TERM_UNDER_48H',
        message: `The test ran ${hours.toFixed(1)} h; a short-term test lasts at least ${SHORT_TERM_MIN_HOURS} h.`,
        source: 'EPA 402-R-92-003 (indoor radon measurement protocols)',
      },
    ];
  }
  return [];
}

/**
 * Checks that a post-mitigation test started at least 24 h after the fan was switched on
 * (ANSI/AARST MAH-2019 §7.3.2), and that a pre-mitigation test did not start after it.
 */
export function checkPostTestTiming(
  test: Pick<RadonTestInput, 'kind' | 'startedAt'>,
  fanActivatedAt: string,
): RadonWarning[] {
  const startMs = parseTime(test.startedAt, 'startedAt');
  const fanMs = parseTime(fanActivatedAt, 'fanActivatedAt');
  const hoursAfterFan = (startMs - fanMs) / HOUR_MS;
  if (test.kind === 'pre') {
    if (hoursAfterFan >= 0) {
      return [
        {
          code: 'PRE_TEST_AFTER_FAN',
          message: 'This pre-mitigation test started after the fan was switched on, so it measures the mitigated home.',
          source: 'ANSI/AARST MAH-2019 §7.3.2',
        },
      ];
    }
    return [];
  }
  if (hoursAfterFan < 0) {
    return [
      {
        code: 'POST_TEST_BEFORE_FAN',
        message: 'This post-mitigation test started before the fan was switched on.',
        source: 'ANSI/AARST MAH-2019 §7.3.2',
      },
    ];
  }
  if (hoursAfterFan < POST_TEST_MIN_HOURS_AFTER_FAN) {
    return [
      {
        code: 'POST_TEST_TOO_SOON',
        message: `This post-mitigation test started ${hoursAfterFan.toFixed(1)} h after the fan; wait at least ${POST_TEST_MIN_HOURS_AFTER_FAN} h.`,
        source: 'ANSI/AARST MAH-2019 §7.3.2',
      },
    ];
  }
  return [];
}

export type RadonClassification = 'below' | 'consider' | 'at_or_above';

export interface ClassificationSettings {
  actionLevelBqM3: number;
  /**
   * Lower edge of the "consider fixing" band. Defaults to EPA's 2 pCi/L (74 Bq/m³);
   * pass null to switch the band off. Ignored when not below the action level.
   */
  considerLevelBqM3?: number | null;
}

/**
 * Classifies a result against the company's action level: "at or above" fixes
 * (EPA: fix at 4 pCi/L or more), "consider" between the consider level and the action level
 * (EPA: consider fixing between 2 and 4 pCi/L), else "below" (EPA, A Citizen's Guide to Radon).
 * Compares the stored Bq/m³ value, not the one-decimal label.
 */
export function classifyResult(radonBqM3: number, settings: ClassificationSettings): RadonClassification {
  const { actionLevelBqM3 } = settings;
  const considerLevelBqM3 =
    settings.considerLevelBqM3 === undefined ? EPA_CONSIDER_LEVEL_BQ_M3 : settings.considerLevelBqM3;
  if (radonBqM3 >= actionLevelBqM3) return 'at_or_above';
  if (considerLevelBqM3 !== null && considerLevelBqM3 < actionLevelBqM3 && radonBqM3 >= considerLevelBqM3) {
    return 'consider';
  }
  return 'below';
}

export interface FollowUpAdvice {
  action: 'test_again_now' | 'follow_up_test' | 'none';
  message: string;
  source: string;
}

/**
 * EPA's follow-up rule for a first short-term result (A Citizen's Guide to Radon): more than
 * twice the action level → take a second short-term test right away; at or above the action
 * level → follow up with a long-term test or a second short-term test, and fix if the
 * long-term result or the average of the two short-term results is at or above it.
 */
export function followUpAdvice(firstShortTermBqM3: number, actionLevelBqM3: number): FollowUpAdvice {
  const source = "EPA, A Citizen's Guide to Radon (402/K-12/002, 2016)";
  if (firstShortTermBqM3 > 2 * actionLevelBqM3) {
    return {
      action: 'test_again_now',
      message:
        'More than twice the action level: take a second short-term test right away; fix if the average of the two is at or above the action level.',
      source,
    };
  }
  if (firstShortTermBqM3 >= actionLevelBqM3) {
    return {
      action: 'follow_up_test',
      message:
        'At or above the action level: follow up with a long-term test or a second short-term test; fix if the long-term result or the average of the two short-term results is at or above the action level.',
      source,
    };
  }
  return { action: 'none', message: 'Below the action level: no follow-up test is needed now.', source };
}
