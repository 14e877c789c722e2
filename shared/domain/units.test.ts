import { describe, expect, it } from 'vitest';
import Qty from 'js-quantities';
import {
  IN_WC_TO_PA,
  PCI_PER_L_TO_BQ_M3,
  bqM3ToPciL,
  cfmToLps,
  cfmToM3h,
  formatRadon,
  ftToM,
  inWcToPa,
  lpsToCfm,
  m3hToCfm,
  mToFt,
  paToInWc,
  pciLToBqM3,
} from './units';

describe('radon concentration units', () => {
  it('uses exactly 37 Bq/m³ per pCi/L', () => {
    // Definition of the curie: 1 Ci = 3.7×10¹⁰ Bq → 1 pCi/L = 0.037 Bq / 0.001 m³ = 37 Bq/m³.
    expect(PCI_PER_L_TO_BQ_M3).toBe(37);
  });

  it('turns the EPA action level of 4 pCi/L into 148 Bq/m³', () => {
    // Definition of the curie; PRODUCT.md check table ("4 pCi/L = 148 Bq/m³").
    expect(pciLToBqM3(4)).toBe(148);
  });

  it('turns the WHO reference level of 100 Bq/m³ into 2.70 pCi/L', () => {
    // Definition of the curie: 100 / 37 = 2.7027…; PRODUCT.md check table ("2.70 pCi/L").
    expect(bqM3ToPciL(100)).toBeCloseTo(2.7, 2);
  });

  it('round-trips pCi/L through Bq/m³', () => {
    // Identity of the exact factor 37 (definition of the curie).
    expect(bqM3ToPciL(pciLToBqM3(3.3))).toBeCloseTo(3.3, 12);
  });

  it('agrees with js-quantities that 1 pCi is 0.037 Bq', () => {
    // npm js-quantities 1.8 (library cross-check): pCi → Bq 0.037.
    expect(Qty('1 pCi').to('Bq').scalar).toBeCloseTo(PCI_PER_L_TO_BQ_M3 / 1000, 12);
  });
});

describe('pressure units', () => {
  it('uses the NIST SP 811 conventional inch of water, 249.0889 Pa', () => {
    // NIST SP 811 (2008) Appendix B.8: inch of water, conventional = 2.490 889 E+02 Pa,
    // which equals 0.0254 m × 1000 kg/m³ × 9.80665 m/s² (standard gravity, CGPM 1901).
    expect(IN_WC_TO_PA).toBe(249.0889);
    expect(0.0254 * 1000 * 9.80665).toBeCloseTo(IN_WC_TO_PA, 4);
  });

  it('stays within 0.01 Pa per inch of js-quantities, which uses the 39.2 °F inch of water', () => {
    // npm js-quantities 1.8: inH2O = 249.082052 Pa (water at 39.2 °F / 4 °C, NIST SP 811 B.8
    // lists 2.490 82 E+02 Pa for that convention). The conventions differ by 0.0069 Pa per inch
    // (2.8×10⁻⁵ relative), so the tolerance is 0.01 Pa per inch.
    const libraryPa = Qty('1 inH2O').to('Pa').scalar;
    expect(libraryPa).toBeCloseTo(249.082052, 6);
    expect(Math.abs(inWcToPa(1) - libraryPa)).toBeLessThan(0.01);
    expect(Math.abs(inWcToPa(1) - libraryPa) / libraryPa).toBeLessThan(3e-5);
  });

  it('round-trips Pa through inches of water', () => {
    // Identity of the single stated factor (NIST SP 811 B.8 conventional).
    expect(paToInWc(inWcToPa(1.75))).toBeCloseTo(1.75, 12);
    expect(paToInWc(249.0889)).toBeCloseTo(1, 12);
  });
});

describe('airflow and length units', () => {
  it('converts 1 CFM to 0.4719 L/s and 1.699 m³/h', () => {
    // NIST SP 811 B.8: cubic foot per minute = 4.719 474 E−04 m³/s (= 0.4719474 L/s);
    // × 3600 s/h = 1.699 011 m³/h.
    expect(cfmToLps(1)).toBeCloseTo(0.4719474, 7);
    expect(cfmToM3h(1)).toBeCloseTo(1.699011, 6);
  });

  it('agrees with js-quantities on CFM to L/s', () => {
    // npm js-quantities 1.8 (library cross-check).
    expect(cfmToLps(50)).toBeCloseTo(Qty('50 ft^3/min').to('L/s').scalar, 9);
  });

  it('round-trips airflow', () => {
    // Identity of the exact factor 0.3048³ (international foot, NIST SP 811 B.8).
    expect(lpsToCfm(cfmToLps(123.4))).toBeCloseTo(123.4, 10);
    expect(m3hToCfm(cfmToM3h(123.4))).toBeCloseTo(123.4, 10);
  });

  it('uses the international foot of exactly 0.3048 m', () => {
    // NIST SP 811 B.8: foot = 3.048 E−01 m (exact).
    expect(ftToM(100)).toBeCloseTo(30.48, 12);
    expect(mToFt(0.3048)).toBeCloseTo(1, 12);
  });
});

describe('formatRadon', () => {
  it('prints one decimal with the unit, as MAH-2019 §8.5.2 reports results', () => {
    // ANSI/AARST MAH-2019 §8.5.2 (one decimal); values from the curie definition.
    expect(formatRadon(148, 'pCi/L')).toBe('4.0 pCi/L');
    expect(formatRadon(100, 'pCi/L')).toBe('2.7 pCi/L');
    expect(formatRadon(148, 'Bq/m3')).toBe('148.0 Bq/m³');
  });

  it('rounds a half up even when binary floating point stores it just below', () => {
    // 1.45 pCi/L × 37 = 53.65 Bq/m³; rounding half away from zero gives 1.5 (common practice
    // in lab reports; ISO 80000-1 Annex B lists it as a rounding rule — from memory).
    expect(formatRadon(53.65, 'pCi/L')).toBe('1.5 pCi/L');
    expect(formatRadon(0.04, 'Bq/m3')).toBe('0.0 Bq/m³');
  });

  it('shows a dash instead of a number for a missing result', () => {
    expect(formatRadon(Number.NaN, 'pCi/L')).toBe('—');
  });
});
