import { describe, expect, it } from 'vitest';
import {
  EPA_ACTION_LEVEL_BQ_M3,
  EPA_CONSIDER_LEVEL_BQ_M3,
  WHO_REFERENCE_LEVEL_BQ_M3,
  averageSideBySide,
  checkPostTestTiming,
  checkTestDuration,
  classifyResult,
  followUpAdvice,
  testDurationHours,
  testTerm,
  type RadonTestInput,
} from './radon-tests';

function test(overrides: Partial<RadonTestInput>): RadonTestInput {
  return {
    kind: 'post',
    device: 'charcoal',
    startedAt: '2024-03-01T09:00:00Z',
    endedAt: '2024-03-03T09:00:00Z',
    resultBqM3: 50,
    sideBySideGroup: null,
    ...overrides,
  };
}

describe('reference levels', () => {
  it('defaults to the EPA action level of 4 pCi/L = 148 Bq/m³ and WHO 100 Bq/m³', () => {
    // EPA Citizen's Guide (4 pCi/L; × 37 by the curie definition); WHO Handbook on Indoor Radon (2009).
    expect(EPA_ACTION_LEVEL_BQ_M3).toBe(148);
    expect(EPA_CONSIDER_LEVEL_BQ_M3).toBe(74);
    expect(WHO_REFERENCE_LEVEL_BQ_M3).toBe(100);
  });
});

describe('averageSideBySide', () => {
  it('reports side-by-side devices as their average', () => {
    // ANSI/AARST MAH-2019 §7.2.1: side-by-side devices are averaged; (100 + 120) / 2 = 110.
    const result = averageSideBySide([
      test({ resultBqM3: 100, sideBySideGroup: 'a' }),
      test({ resultBqM3: 120, sideBySideGroup: 'a' }),
    ]);
    expect(result).toHaveLength(1);
    expect(result[0].resultBqM3).toBe(110);
    expect(result[0].deviceCount).toBe(2);
  });

  it('keeps ungrouped tests apart and orders everything by end time', () => {
    // MAH-2019 §7.2.1 (only side-by-side devices are averaged); arithmetic mean of 30 and 40 = 35.
    const result = averageSideBySide([
      test({ resultBqM3: 200, startedAt: '2024-04-01T00:00:00Z', endedAt: '2024-04-03T00:00:00Z' }),
      test({ resultBqM3: 30, sideBySideGroup: 'g1' }),
      test({ resultBqM3: 40, sideBySideGroup: 'g1' }),
      test({ resultBqM3: 90, startedAt: '2024-02-01T00:00:00Z', endedAt: '2024-02-03T00:00:00Z' }),
    ]);
    expect(result.map((r) => r.resultBqM3)).toEqual([90, 35, 200]);
  });

  it('never merges a pre and a post test that share a group id', () => {
    // MAH-2019 §7.2.1 averages devices of one measurement only.
    const result = averageSideBySide([
      test({ kind: 'pre', resultBqM3: 300, sideBySideGroup: 'x' }),
      test({ kind: 'post', resultBqM3: 20, sideBySideGroup: 'x' }),
    ]);
    expect(result).toHaveLength(2);
  });
});

describe('test duration', () => {
  it('measures hours between start and end', () => {
    // 2 days = 48 h (calendar arithmetic).
    expect(testDurationHours(test({}))).toBe(48);
  });

  it('accepts a 48-hour charcoal test', () => {
    // EPA 402-R-92-003: short-term tests last at least 48 h.
    expect(checkTestDuration(test({}))).toEqual([]);
  });

  it('warns about a charcoal test shorter than 48 hours', () => {
    // EPA 402-R-92-003: at least 48 h.
    const warnings = checkTestDuration(test({ endedAt: '2024-03-03T08:00:00Z' }));
    expect(warnings.map((w) => w.code)).toEqual(['SHORT_TERM_UNDER_48H']);
    expect(warnings[0].source).toMatch(/402-R-92-003/);
  });

  it('accepts 46 hours from a continuous monitor but not 45', () => {
    // ANSI/AARST MAH-2019 §8.5.3: continuous monitors need at least 46 h of data.
    const ok = test({ device: 'continuous_monitor', endedAt: '2024-03-03T07:00:00Z' });
    const short = test({ device: 'continuous_monitor', endedAt: '2024-03-03T06:00:00Z' });
    expect(checkTestDuration(ok)).toEqual([]);
    expect(checkTestDuration(short).map((w) => w.code)).toEqual(['CONTINUOUS_MONITOR_UNDER_46H']);
  });

  it('flags a test whose end is before its start', () => {
    const warnings = checkTestDuration(test({ endedAt: '2024-02-28T09:00:00Z' }));
    expect(warnings.map((w) => w.code)).toEqual(['TEST_ENDS_BEFORE_START']);
  });

  it('calls a test longer than 90 days long-term', () => {
    // EPA 402-R-92-003 / Citizen's Guide: short-term 2–90 days, long-term more than 90 days.
    expect(testTerm({ startedAt: '2024-01-01T00:00:00Z', endedAt: '2024-03-31T00:00:00Z' })).toBe('short_term');
    expect(testTerm({ startedAt: '2024-01-01T00:00:00Z', endedAt: '2024-04-02T00:00:00Z' })).toBe('long_term');
  });

  it('rejects a time that is not ISO 8601', () => {
    expect(() => testDurationHours({ startedAt: 'yesterday', endedAt: '2024-01-01T00:00:00Z' })).toThrow(RangeError);
  });
});

describe('post-mitigation test timing', () => {
  const fanOn = '2024-03-01T09:00:00Z';

  it('accepts a post test starting 24 hours after the fan', () => {
    // ANSI/AARST MAH-2019 §7.3.2: no sooner than 24 h after the fan runs.
    expect(checkPostTestTiming({ kind: 'post', startedAt: '2024-03-02T09:00:00Z' }, fanOn)).toEqual([]);
  });

  it('warns about a post test starting 23 hours after the fan', () => {
    // ANSI/AARST MAH-2019 §7.3.2.
    const warnings = checkPostTestTiming({ kind: 'post', startedAt: '2024-03-02T08:00:00Z' }, fanOn);
    expect(warnings.map((w) => w.code)).toEqual(['POST_TEST_TOO_SOON']);
    expect(warnings[0].source).toBe('ANSI/AARST MAH-2019 §7.3.2');
  });

  it('warns about a post test that began before the fan ran', () => {
    // ANSI/AARST MAH-2019 §7.3.2.
    const warnings = checkPostTestTiming({ kind: 'post', startedAt: '2024-02-28T08:00:00Z' }, fanOn);
    expect(warnings.map((w) => w.code)).toEqual(['POST_TEST_BEFORE_FAN']);
  });

  it('warns about a pre-mitigation test that began after the fan ran', () => {
    const warnings = checkPostTestTiming({ kind: 'pre', startedAt: '2024-03-05T08:00:00Z' }, fanOn);
    expect(warnings.map((w) => w.code)).toEqual(['PRE_TEST_AFTER_FAN']);
  });
});

describe('classifyResult', () => {
  const epa = { actionLevelBqM3: EPA_ACTION_LEVEL_BQ_M3 };

  it('fixes at 4 pCi/L and above', () => {
    // EPA Citizen's Guide: fix at 4 pCi/L (148 Bq/m³) or more.
    expect(classifyResult(148, epa)).toBe('at_or_above');
    expect(classifyResult(400, epa)).toBe('at_or_above');
  });

  it('suggests considering a fix between 2 and 4 pCi/L', () => {
    // EPA Citizen's Guide: consider fixing between 2 (74 Bq/m³) and 4 pCi/L.
    expect(classifyResult(74, epa)).toBe('consider');
    expect(classifyResult(147.9, epa)).toBe('consider');
    expect(classifyResult(73.9, epa)).toBe('below');
  });

  it('follows a company that adopts the WHO reference level', () => {
    // WHO Handbook on Indoor Radon (2009): 100 Bq/m³ reference level.
    const who = { actionLevelBqM3: WHO_REFERENCE_LEVEL_BQ_M3 };
    expect(classifyResult(100, who)).toBe('at_or_above');
    expect(classifyResult(80, who)).toBe('consider');
  });

  it('can switch the consider band off', () => {
    expect(classifyResult(100, { actionLevelBqM3: 148, considerLevelBqM3: null })).toBe('below');
  });
});

describe('followUpAdvice', () => {
  it('asks for a second test right away above twice the action level', () => {
    // EPA Citizen's Guide: more than twice the action level (8 pCi/L = 296 Bq/m³) → test again right away.
    expect(followUpAdvice(300, 148).action).toBe('test_again_now');
  });

  it('asks for a follow-up test at or above the action level up to twice it', () => {
    // EPA Citizen's Guide: ≥ 4 pCi/L → long-term or second short-term follow-up.
    expect(followUpAdvice(148, 148).action).toBe('follow_up_test');
    expect(followUpAdvice(296, 148).action).toBe('follow_up_test');
  });

  it('needs no follow-up below the action level', () => {
    // EPA Citizen's Guide.
    const advice = followUpAdvice(100, 148);
    expect(advice.action).toBe('none');
    expect(advice.source).toMatch(/Citizen's Guide/);
  });
});
