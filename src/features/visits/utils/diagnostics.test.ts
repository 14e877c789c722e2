import { describe, expect, it } from 'vitest';
import { fanStaticAt, pipePressureLossPa } from '@shared/domain/pipe-diagnostics';
import { paToInWc } from '@shared/domain/units';
import { computeDiagnostics, type DiagnosticsInput } from './diagnostics';

// An invented curve of the usual shape for an in-line radon fan (the demo data's curves are invented too).
const fan = {
  id: '00000000-0000-4000-8000-000000000001',
  name: 'Demo mid-range fan',
  maxStaticInWc: 2.4,
  curve: [
    { flowCfm: 0, staticInWc: 2.4 },
    { flowCfm: 40, staticInWc: 2.0 },
    { flowCfm: 80, staticInWc: 1.4 },
    { flowCfm: 120, staticInWc: 0.6 },
    { flowCfm: 150, staticInWc: 0 },
  ],
};
const base: DiagnosticsInput = { fan, vacuumInWc: 1.2, pipeSizeIn: 3, pipeLengthFt: 20, elbows: 3, holes: [], targetPa: 1 };

describe('visit diagnostics', () => {
  it('says what is missing instead of showing a number', () => {
    const d = computeDiagnostics({ ...base, fan: null, vacuumInWc: null, pipeSizeIn: null });
    expect(d.pipeOnly).toEqual({ ok: false, reason: expect.stringContaining('Choose the fan') });
    expect(d.measured.ok).toBe(false);
    expect(d.hint.ok).toBe(false);
    expect(d.field).toEqual({ ok: false, reason: expect.stringContaining('at least two test holes') });
    expect(d.coverage).toEqual({ ok: false, reason: expect.stringContaining('No slab footprint') });
    expect(computeDiagnostics({ ...base, vacuumInWc: null }).measured).toEqual({ ok: false, reason: 'Enter the manometer vacuum.' });
    expect(computeDiagnostics({ ...base, elbows: null }).pipeOnly).toEqual({ ok: false, reason: expect.stringContaining('pipe size') });
  });

  it('puts the measured vacuum plus the pipe loss on the fan curve (checked by substituting back)', () => {
    const d = computeDiagnostics(base);
    if (!d.measured.ok) throw new Error(d.measured.reason);
    const { flowCfm } = d.measured.value;
    const lossInWc = paToInWc(pipePressureLossPa({ nominalSizeIn: 3, lengthFt: 20, elbows: 3, flowCfm }));
    expect(fanStaticAt({ points: fan.curve }, flowCfm)).toBeCloseTo(1.2 + lossInWc, 6);
    expect(d.measured.value.pipeLossInWc).toBeCloseTo(lossInWc, 9);
    // The fan alone makes 1.2 in. WC at 90 CFM (between its 80 and 120 CFM points); the pipe's own loss
    // on top of the reading means less flow than that.
    expect(flowCfm).toBeGreaterThan(40);
    expect(flowCfm).toBeLessThan(90);
    expect(d.hint.ok && d.hint.value.kind).toBe('typical');
  });

  it('finds the pipe-only operating point where the fan static equals the pipe loss', () => {
    const d = computeDiagnostics(base);
    if (!d.pipeOnly.ok) throw new Error(d.pipeOnly.reason);
    const { flowCfm, pipeLossInWc } = d.pipeOnly.value;
    expect(fanStaticAt({ points: fan.curve }, flowCfm)).toBeCloseTo(pipeLossInWc, 6);
  });

  it('reads a reading near the fan maximum with little flow as a starved suction point (common practice)', () => {
    const d = computeDiagnostics({ ...base, vacuumInWc: 2.3 });
    expect(d.hint.ok && d.hint.value.kind).toBe('starved');
  });

  it('fits the pressure field and reads the radius at the target differential', () => {
    // 10 Pa at 10 ft and 1 Pa at 20 ft: dp = 100 Pa · e^(−d·ln10/10), which reaches 1 Pa at 20 ft.
    const d = computeDiagnostics({ ...base, holes: [{ distanceFt: 10, differentialPa: 10 }, { distanceFt: 20, differentialPa: 1 }] });
    if (!d.field.ok) throw new Error(d.field.reason);
    expect(d.field.value.fit.amplitudePa).toBeCloseTo(100, 6);
    expect(d.field.value.radiusFt).toBeCloseTo(20, 6);
    const half = computeDiagnostics({ ...base, targetPa: 10, holes: [{ distanceFt: 10, differentialPa: 10 }, { distanceFt: 20, differentialPa: 1 }] });
    expect(half.field.ok && half.field.value.radiusFt).toBeCloseTo(10, 6);
  });

  it('checks the footprint when one is on record', () => {
    // A 20 ft × 20 ft slab centred on the suction point; a 20 ft radius covers it (half-diagonal ≈ 14.1 ft).
    const lat = 45;
    const dLat = 10 / 364_000; // ≈ 10 ft in degrees of latitude
    const dLon = dLat / Math.cos((lat * Math.PI) / 180);
    const polygon = { type: 'Polygon' as const, coordinates: [[[-dLon, lat - dLat], [dLon, lat - dLat], [dLon, lat + dLat], [-dLon, lat + dLat], [-dLon, lat - dLat]]] };
    const holes = [{ distanceFt: 10, differentialPa: 10 }, { distanceFt: 20, differentialPa: 1 }];
    const d = computeDiagnostics({ ...base, holes, footprint: { polygon, suctionPoint: [0, lat] } });
    expect(d.coverage.ok && d.coverage.value.fullyCovered).toBe(true);
  });
});
