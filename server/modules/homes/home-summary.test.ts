import { describe, expect, it } from 'vitest';
import { summariseHome } from './home-summary.js';

// EPA action level 4 pCi/L = 148 Bq/m³ (EPA, A Citizen's Guide to Radon; 1 pCi/L = 37 Bq/m³ by the curie definition).
const ACTION_LEVEL_BQ_M3 = 148;

describe('summariseHome', () => {
  it('keeps the rework reasons of completed visits only, distinct and sorted', () => {
    const summary = summariseHome(
      [
        { visitedOn: '2026-03-01', status: 'completed', reworkNeeded: true, reworkDone: false, vacuumPa: 300, reworkReasons: ['sealed_opening', 'added_suction_point'] },
        { visitedOn: '2026-04-01', status: 'completed', reworkNeeded: false, reworkDone: true, vacuumPa: 350, reworkReasons: ['sealed_opening'] },
        { visitedOn: '2026-05-01', status: 'declined', reworkNeeded: false, reworkDone: false, vacuumPa: null, reworkReasons: ['larger_fan'] },
      ],
      [],
      ACTION_LEVEL_BQ_M3,
    );
    expect(summary.reworkReasons).toEqual(['added_suction_point', 'sealed_opening']);
    expect(summary.reworkFlag).toBe(true);
    expect(summary.lastVacuumPa).toBe(350);
  });

  it('has no reasons for a home never reworked', () => {
    const summary = summariseHome([{ visitedOn: '2026-03-01', status: 'completed', reworkNeeded: false, reworkDone: false, vacuumPa: 120 }], [], ACTION_LEVEL_BQ_M3);
    expect(summary.reworkReasons).toEqual([]);
  });
});
