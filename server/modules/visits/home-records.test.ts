import { describe, expect, it } from 'vitest';
import { activationFor, testWarnings } from './home-records.js';

const at = (iso: string) => new Date(iso);

describe('activationFor', () => {
  const first = at('2026-03-01T10:00:00Z');
  const rework = at('2026-03-20T10:00:00Z');

  it('judges a test by the latest fan start at or before it, not by a later re-activation', () => {
    expect(activationFor(at('2026-03-05T10:00:00Z'), [first, rework])).toEqual(first);
    expect(activationFor(at('2026-03-21T10:00:00Z'), [first, rework])).toEqual(rework);
  });

  it('falls back to the first fan start after the test, and to none without any', () => {
    expect(activationFor(at('2026-02-01T10:00:00Z'), [rework, first])).toEqual(first);
    expect(activationFor(at('2026-02-01T10:00:00Z'), [])).toBeNull();
  });
});

describe('testWarnings', () => {
  const fanOn = [at('2026-03-01T10:00:00Z')];
  const post = { kind: 'post' as const, device: 'charcoal' as const, resultBqM3: 50 };

  it('warns of a post test 12 h after the fan (ANSI/AARST MAH-2019 §7.3.2: at least 24 h) lasting 36 h (EPA 402-R-92-003: at least 48 h)', () => {
    const codes = testWarnings({ ...post, startedAt: '2026-03-01T22:00:00Z', endedAt: '2026-03-03T10:00:00Z' }, fanOn).map((w) => w.code);
    expect(codes.sort()).toEqual(['POST_TEST_TOO_SOON', 'SHORT_TERM_UNDER_48H']);
  });

  it('has nothing to say about a post test 24 h after the fan lasting 48 h (both limits met exactly)', () => {
    expect(testWarnings({ ...post, startedAt: '2026-03-02T10:00:00Z', endedAt: '2026-03-04T10:00:00Z' }, fanOn)).toEqual([]);
  });

  it('checks only the length when the home has no fan start on record', () => {
    expect(testWarnings({ ...post, startedAt: '2026-03-01T22:00:00Z', endedAt: '2026-03-03T10:00:00Z' }, []).map((w) => w.code)).toEqual(['SHORT_TERM_UNDER_48H']);
  });
});
