import { describe, expect, it } from 'vitest';
import {
  AIR_20C_DENSITY_KG_M3,
  AIR_20C_VISCOSITY_PA_S,
  PVC_SCH40_INSIDE_DIAMETER_IN,
  colebrookFrictionFactor,
  diagnoseVacuum,
  elbowEquivalentLengthM,
  fanStaticAt,
  flowFromMeasuredVacuum,
  operatingPoint,
  pipeLossCurveInWc,
  pipePressureLossPa,
  reynoldsNumber,
  swameeJainFrictionFactor,
  type FanCurve,
} from './pipe-diagnostics';

// ---- Independent implementation used only to cross-check the module -------------------
// Colebrook (1939) solved by bisection on f itself (the module uses Newton on 1/√f), with
// the diameter, flow and air properties typed in from the sources rather than imported.
const D3_M = 3.068 * 0.0254; // ASTM D1785, 3" Sch 40 ID
const CFM_M3S = 0.3048 ** 3 / 60; // NIST SP 811 B.8
function colebrookByBisection(re: number, relRough: number): number {
  const residual = (f: number) => 1 / Math.sqrt(f) + 2 * Math.log10(relRough / 3.7 + 2.51 / (re * Math.sqrt(f)));
  let lo = 0.001;
  let hi = 0.2;
  for (let i = 0; i < 200; i += 1) {
    const mid = (lo + hi) / 2;
    // residual falls as f rises
    if (residual(mid) > 0) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
function haaland(re: number, relRough: number): number {
  // Haaland (1983), J. Fluids Eng. 105:89 — explicit, within about 2 % of Colebrook.
  const x = -1.8 * Math.log10((relRough / 3.7) ** 1.11 + 6.9 / re);
  return 1 / (x * x);
}
function independentLossPa(flowCfm: number, lengthM: number): number {
  const area = (Math.PI / 4) * D3_M * D3_M;
  const v = (flowCfm * CFM_M3S) / area;
  const re = (1.2041 * v * D3_M) / 1.813e-5;
  const f = colebrookByBisection(re, 0.0015e-3 / D3_M);
  return f * (lengthM / D3_M) * 0.5 * 1.2041 * v * v;
}

describe('PVC Schedule 40 pipe data', () => {
  it('uses the ASTM D1785 inside diameters', () => {
    // ASTM D1785 Sch 40: 2" 2.067, 3" 3.068 (3.500 − 2×0.216), 4" 4.026 (4.500 − 2×0.237), 6" 6.065 in.
    expect(PVC_SCH40_INSIDE_DIAMETER_IN[2]).toBe(2.067);
    expect(PVC_SCH40_INSIDE_DIAMETER_IN[3]).toBeCloseTo(3.5 - 2 * 0.216, 10);
    expect(PVC_SCH40_INSIDE_DIAMETER_IN[4]).toBeCloseTo(4.5 - 2 * 0.237, 10);
    expect(PVC_SCH40_INSIDE_DIAMETER_IN[6]).toBe(6.065);
  });

  it('uses standard air at 20 °C', () => {
    // Standard air tables, 20 °C and 101.325 kPa (PRODUCT.md check table).
    expect(AIR_20C_DENSITY_KG_M3).toBe(1.2041);
    expect(AIR_20C_VISCOSITY_PA_S).toBe(1.813e-5);
  });

  it('counts a 90° elbow as 7.67 ft of 3" pipe and 10.1 ft of 4" pipe', () => {
    // 2018 IRC Appendix A, Table A.2.2 (L/D = 30).
    expect(elbowEquivalentLengthM(3) / 0.3048).toBeCloseTo(7.67, 2);
    expect(elbowEquivalentLengthM(4) / 0.3048).toBeCloseTo(10.1, 1);
  });
});

describe('friction factor', () => {
  it('matches an independent Colebrook solution to 1e-9', () => {
    // Colebrook (1939) by bisection (written in this test) vs the module's Newton iteration.
    for (const [re, rr] of [[4000, 0], [25_606, 1.925e-5], [1e5, 1e-4], [1e7, 1e-3]]) {
      expect(colebrookFrictionFactor(re, rr)).toBeCloseTo(colebrookByBisection(re, rr), 9);
    }
  });

  it('reads the Moody chart value f ≈ 0.018 for a smooth pipe at Re = 10⁵', () => {
    // Moody (1944) chart, smooth-pipe curve at Re = 10⁵ (f ≈ 0.0180).
    expect(colebrookFrictionFactor(1e5, 0)).toBeCloseTo(0.018, 3);
  });

  it('stays within 3 % of Blasius 0.316/Re^0.25 for smooth pipe up to Re = 10⁵', () => {
    // Blasius (1913), valid for smooth pipes, 4000 < Re < 10⁵.
    for (const re of [1e4, 3e4, 1e5]) {
      const blasius = 0.316 / re ** 0.25;
      expect(Math.abs(colebrookFrictionFactor(re, 0) / blasius - 1)).toBeLessThan(0.03);
    }
  });

  it('keeps Swamee–Jain close to Colebrook over the range radon vent pipe sees', () => {
    // Swamee & Jain (1976) state "about 1 %" for 1e-6 ≤ ε/D ≤ 1e-2, 5000 ≤ Re ≤ 1e8. Measured
    // against the converged Colebrook here the gap reaches 1.25 % at Re = 5000, so 1.5 % is
    // asserted over PVC vent pipe conditions (ε/D ≈ 1e-5, Re 5·10³–10⁶).
    for (const re of [5000, 2e4, 1e5, 1e6]) {
      for (const rr of [1e-6, 1e-5, 1e-4]) {
        const ratio = swameeJainFrictionFactor(re, rr) / colebrookFrictionFactor(re, rr);
        expect(Math.abs(ratio - 1)).toBeLessThan(0.015);
      }
    }
  });

  it('keeps Swamee–Jain within 3 % anywhere in its stated range', () => {
    // Swamee & Jain (1976) range; the rough, low-Re corner (ε/D = 1e-2, Re = 5000) deviates
    // 2.8 %, more than the stated ~1 % — reviews of explicit formulas report the same
    // (Brkić 2011, J. Petroleum Sci. Eng. — from memory).
    for (const re of [5000, 1e5, 1e8]) {
      for (const rr of [1e-6, 1e-2]) {
        const ratio = swameeJainFrictionFactor(re, rr) / colebrookFrictionFactor(re, rr);
        expect(Math.abs(ratio - 1)).toBeLessThan(0.03);
      }
    }
  });
});

describe('pipe pressure loss (PRODUCT.md check: 3" Sch 40, 50 CFM, air at 20 °C)', () => {
  it('has Re ≈ 25,600', () => {
    // PRODUCT.md check table (computed): Re ≈ 25,600.
    expect(reynoldsNumber({ flowCfm: 50, nominalSizeIn: 3 })).toBeGreaterThan(25_550);
    expect(reynoldsNumber({ flowCfm: 50, nominalSizeIn: 3 })).toBeLessThan(25_650);
  });

  it('has f ≈ 0.0244', () => {
    // PRODUCT.md check table (computed, Colebrook): f ≈ 0.0244; Haaland (1983) within 2 %.
    const re = reynoldsNumber({ flowCfm: 50, nominalSizeIn: 3 });
    const f = colebrookFrictionFactor(re, 0.0015e-3 / D3_M);
    expect(f).toBeCloseTo(0.0244, 4);
    expect(Math.abs(haaland(re, 0.0015e-3 / D3_M) / f - 1)).toBeLessThan(0.02);
  });

  it('loses about 141 Pa per 100 ft, as an independent Darcy–Weisbach computation does', () => {
    // PRODUCT.md check table (computed): Δp ≈ 141 Pa per 100 ft; cross-checked by the
    // bisection-Colebrook implementation written in this test.
    const lossPa = pipePressureLossPa({ flowCfm: 50, nominalSizeIn: 3, lengthFt: 100, elbows: 0 });
    expect(lossPa).toBeCloseTo(141, 0);
    expect(lossPa).toBeCloseTo(independentLossPa(50, 100 * 0.3048), 6);
  });

  it('adds 30 diameters of pipe for each elbow', () => {
    // 2018 IRC App. A Table A.2.2 (L/D = 30) with the independent Darcy–Weisbach above.
    const lossPa = pipePressureLossPa({ flowCfm: 50, nominalSizeIn: 3, lengthFt: 20, elbows: 3 });
    expect(lossPa).toBeCloseTo(independentLossPa(50, 20 * 0.3048 + 3 * 30 * D3_M), 6);
  });

  it('loses much less in 4" pipe than in 3" at the same flow', () => {
    // Darcy–Weisbach scales roughly as D^-4.8 at fixed flow (common practice); (4.026/3.068)^4.8 ≈ 3.7.
    const loss3 = pipePressureLossPa({ flowCfm: 50, nominalSizeIn: 3, lengthFt: 100, elbows: 0 });
    const loss4 = pipePressureLossPa({ flowCfm: 50, nominalSizeIn: 4, lengthFt: 100, elbows: 0 });
    expect(loss3 / loss4).toBeGreaterThan(3.3);
    expect(loss3 / loss4).toBeLessThan(4.1);
  });

  it('is zero without flow and rejects negative inputs', () => {
    expect(pipePressureLossPa({ flowCfm: 0, nominalSizeIn: 3, lengthFt: 10, elbows: 1 })).toBe(0);
    expect(() => pipePressureLossPa({ flowCfm: -1, nominalSizeIn: 3, lengthFt: 10, elbows: 1 })).toThrow(RangeError);
  });
});

describe('fan curve and operating point', () => {
  // A straight-line fan curve (3.0 in. WC shut-off, 150 CFM free air), invented for the test.
  const linearFan: FanCurve = { points: [{ flowCfm: 0, staticInWc: 3 }, { flowCfm: 150, staticInWc: 0 }] };

  it('interpolates the fan curve linearly and holds the end values outside it', () => {
    // Linear interpolation (arithmetic): halfway between 3.0 and 0 is 1.5.
    expect(fanStaticAt(linearFan, 75)).toBeCloseTo(1.5, 12);
    expect(fanStaticAt(linearFan, 200)).toBe(0);
  });

  it('meets a quadratic system curve where the analytic solution says', () => {
    // Solved by hand: 3(1 − Q/150) = 1e-4·Q² → 1e-4·Q² + 0.02·Q − 3 = 0 → Q = 100 CFM, 1.0 in. WC.
    const point = operatingPoint(linearFan, (q) => 1e-4 * q * q);
    expect(point?.flowCfm).toBeCloseTo(100, 6);
    expect(point?.staticInWc).toBeCloseTo(1, 6);
  });

  it('finds no operating point when the system needs more than the fan can give', () => {
    expect(operatingPoint(linearFan, (q) => 3.5 + 1e-4 * q * q)).toBeNull();
  });

  it('rejects a fan curve whose static pressure rises with flow', () => {
    const bad: FanCurve = { points: [{ flowCfm: 0, staticInWc: 1 }, { flowCfm: 100, staticInWc: 2 }] };
    expect(() => fanStaticAt(bad, 50)).toThrow(RangeError);
  });

  it('recovers the flow from a manometer reading', () => {
    // Round trip built with the independent Darcy–Weisbach above: choose 60 CFM in 30 ft of
    // 3" pipe with 3 elbows and a 1.2 in. WC reading, and make the linear fan pass through
    // (60 CFM, 1.2 in. WC + pipe loss); the estimate must return 60 CFM.
    const lossInWc = independentLossPa(60, 30 * 0.3048 + 3 * 30 * D3_M) / 249.0889; // NIST SP 811 B.8
    const shutOff = (1.2 + lossInWc) / (1 - 60 / 200);
    const fan: FanCurve = { points: [{ flowCfm: 0, staticInWc: shutOff }, { flowCfm: 200, staticInWc: 0 }] };
    const estimate = flowFromMeasuredVacuum({ curve: fan, vacuumInWc: 1.2, nominalSizeIn: 3, lengthFt: 30, elbows: 3 });
    expect(estimate?.flowCfm).toBeCloseTo(60, 4);
    expect(estimate?.pipeLossInWc).toBeCloseTo(lossInWc, 6);
  });

  it('gives no flow for a reading above the fan’s maximum', () => {
    expect(flowFromMeasuredVacuum({ curve: linearFan, vacuumInWc: 3.4, nominalSizeIn: 3, lengthFt: 20, elbows: 2 })).toBeNull();
  });

  it('builds the pipe system curve in in. WC', () => {
    // 141 Pa per 100 ft (PRODUCT.md check) ÷ 249.0889 Pa/in. WC (NIST SP 811 B.8) ≈ 0.565 in. WC.
    expect(pipeLossCurveInWc({ nominalSizeIn: 3, lengthFt: 100, elbows: 0 })(50)).toBeCloseTo(0.565, 2);
  });
});

describe('diagnoseVacuum (common practice, follows from the fan curve)', () => {
  // Illustrative curve invented for the test, not a manufacturer's data: 4.0 in. WC shut-off, 180 CFM free air.
  const fan: FanCurve = {
    points: [
      { flowCfm: 0, staticInWc: 4 },
      { flowCfm: 50, staticInWc: 3.2 },
      { flowCfm: 100, staticInWc: 2.2 },
      { flowCfm: 150, staticInWc: 1 },
      { flowCfm: 180, staticInWc: 0 },
    ],
  };

  it('calls a reading near the maximum with little flow a starved suction point', () => {
    // Common practice: near the fan's maximum static pressure with little flow = starved.
    const result = diagnoseVacuum({ curve: fan, vacuumInWc: 3.6, flowCfm: 10 });
    expect(result.kind).toBe('starved');
    expect(result.message).toMatch(/suction point/);
  });

  it('calls a very low reading with high flow leaky', () => {
    // Common practice: very low reading with high flow = openings or leaks.
    expect(diagnoseVacuum({ curve: fan, vacuumInWc: 0.5, flowCfm: 140 }).kind).toBe('leaky');
  });

  it('calls a mid-curve reading typical', () => {
    // Common practice: a good gravel bed reads well under 2 in. WC.
    const result = diagnoseVacuum({ curve: fan, vacuumInWc: 1.2, flowCfm: 95 });
    expect(result.kind).toBe('typical');
    expect(result.message).not.toMatch(/2 in\. WC/);
  });

  it('notes when a typical reading is above what a good gravel bed gives', () => {
    // Common practice: well under 2 in. WC on a good gravel bed.
    expect(diagnoseVacuum({ curve: fan, vacuumInWc: 2.5, flowCfm: 70 }).message).toMatch(/2 in\. WC/);
  });

  it('flags readings that do not fit the curve', () => {
    expect(diagnoseVacuum({ curve: fan, vacuumInWc: 4.5, flowCfm: 5 }).kind).toBe('out_of_range');
    expect(diagnoseVacuum({ curve: fan, vacuumInWc: 1, flowCfm: null }).kind).toBe('out_of_range');
  });

  it('calls for service when the gauge reads zero', () => {
    // ANSI/AARST CCAH-2020 Exhibit 2: a zero reading calls for service.
    const result = diagnoseVacuum({ curve: fan, vacuumInWc: 0, flowCfm: 0 });
    expect(result.kind).toBe('out_of_range');
    expect(result.basis).toMatch(/CCAH-2020/);
  });

  it('diagnoses a starved point end to end from the reading alone', () => {
    // Common practice; flow estimated from the illustrative curve and 20 ft of 3" pipe.
    const estimate = flowFromMeasuredVacuum({ curve: fan, vacuumInWc: 3.7, nominalSizeIn: 3, lengthFt: 20, elbows: 2 });
    expect(estimate).not.toBeNull();
    expect(diagnoseVacuum({ curve: fan, vacuumInWc: 3.7, flowCfm: estimate?.flowCfm ?? null }).kind).toBe('starved');
  });
});
