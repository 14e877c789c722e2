// Unit conversions for radon concentrations, fan pressures, airflow and lengths.
// Storage units are SI (Bq/m³, Pa, m); imperial values are for display and input only.

/**
 * Bq/m³ per pCi/L. Exact by definition: 1 Ci = 3.7×10¹⁰ Bq, so 1 pCi = 0.037 Bq and
 * 1 pCi/L = 0.037 Bq / 0.001 m³ = 37 Bq/m³.
 */
export const PCI_PER_L_TO_BQ_M3 = 37;

/**
 * Pascals per inch of water column.
 * Convention: NIST SP 811 (2008) Appendix B.8, "inch of water, conventional (inH₂O)"
 * = 2.490 889 E+02 Pa, i.e. 0.0254 m × 1000 kg/m³ × 9.80665 m/s². We pick the conventional
 * value because it is defined exactly (no water temperature to argue about); the 39.2 °F
 * value (249.082 Pa) and the 60 °F value (248.84 Pa) differ from it by < 0.1 %, far below
 * the resolution of a field U-tube or digital manometer.
 */
export const IN_WC_TO_PA = 249.0889;

/** Metres per international foot (exact, 1959 agreement; NIST SP 811 B.8). */
export const FT_TO_M = 0.3048;

/** Cubic metres per cubic foot: 0.3048³ (exact). */
const FT3_TO_M3 = FT_TO_M ** 3;

/** Litres per second in one cubic foot per minute (0.3048³ m³ × 1000 L/m³ ÷ 60 s). */
export const CFM_TO_LPS = (FT3_TO_M3 * 1000) / 60;

/** Cubic metres per hour in one cubic foot per minute (0.3048³ m³ × 60 min/h). */
export const CFM_TO_M3H = FT3_TO_M3 * 60;

/** Converts a radon concentration from pCi/L to Bq/m³ (exact factor 37). */
export function pciLToBqM3(radonPciL: number): number {
  return radonPciL * PCI_PER_L_TO_BQ_M3;
}

/** Converts a radon concentration from Bq/m³ to pCi/L. */
export function bqM3ToPciL(radonBqM3: number): number {
  return radonBqM3 / PCI_PER_L_TO_BQ_M3;
}

/** Converts inches of water column to pascals (NIST SP 811 conventional inch of water). */
export function inWcToPa(pressureInWc: number): number {
  return pressureInWc * IN_WC_TO_PA;
}

/** Converts pascals to inches of water column (NIST SP 811 conventional inch of water). */
export function paToInWc(pressurePa: number): number {
  return pressurePa / IN_WC_TO_PA;
}

/** Converts cubic feet per minute to litres per second. */
export function cfmToLps(flowCfm: number): number {
  return flowCfm * CFM_TO_LPS;
}

/** Converts litres per second to cubic feet per minute. */
export function lpsToCfm(flowLps: number): number {
  return flowLps / CFM_TO_LPS;
}

/** Converts cubic feet per minute to cubic metres per hour. */
export function cfmToM3h(flowCfm: number): number {
  return flowCfm * CFM_TO_M3H;
}

/** Converts cubic metres per hour to cubic feet per minute. */
export function m3hToCfm(flowM3h: number): number {
  return flowM3h / CFM_TO_M3H;
}

/** Converts feet to metres (international foot). */
export function ftToM(lengthFt: number): number {
  return lengthFt * FT_TO_M;
}

/** Converts metres to feet (international foot). */
export function mToFt(lengthM: number): number {
  return lengthM / FT_TO_M;
}

export type RadonDisplayUnit = 'pCi/L' | 'Bq/m3';

/**
 * Rounds half away from zero to one decimal. The value is first cut to 12 significant
 * digits so binary noise (e.g. 1.45 stored as 1.4499999…) does not decide the rounding.
 */
function roundToOneDecimal(value: number): number {
  const cleaned = Number(value.toPrecision(12));
  const rounded = Math.sign(cleaned) * Math.round(Math.abs(cleaned) * 10) / 10;
  return rounded === 0 ? 0 : rounded; // never print "-0.0"
}

/**
 * Formats a stored Bq/m³ value for display in the chosen unit, to one decimal place as
 * ANSI/AARST MAH-2019 §8.5.2 asks results to be reported (e.g. "4.0 pCi/L", "148.0 Bq/m³").
 */
export function formatRadon(radonBqM3: number, unit: RadonDisplayUnit): string {
  if (!Number.isFinite(radonBqM3)) return '—';
  if (unit === 'pCi/L') return `${roundToOneDecimal(bqM3ToPciL(radonBqM3)).toFixed(1)} pCi/L`;
  return `${roundToOneDecimal(radonBqM3).toFixed(1)} Bq/m³`;
}
