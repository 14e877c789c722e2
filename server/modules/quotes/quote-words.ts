// Words the quote PDF and the e-mails share. The cautions follow PRODUCT.md ("Cautions the UI
// shows") and defer to local codes and licensed practice.

export const QUOTE_CAUTIONS = [
  'Fan wiring is electrical work: it follows the electrical code, on a dedicated, labelled circuit or the junction box the builder left, by someone licensed to do it where the code requires.',
  'The vent discharges above the roof edge and away from windows, doors and air intakes, as the applicable radon mitigation standard and the local code require.',
  'Lowering the pressure under a slab can backdraft fuel-burning appliances (furnace, water heater, fireplace): we check them after every activation.',
  'Work in attics and on roofs carries fall and heat risks; only trained crews do it.',
  'Radon results guide health decisions: retest after any change to the system and at least every two years; a result at or above the action level calls for a certified radon professional.',
  'Local building, electrical and mechanical codes and licensed practice come first: where they ask for more than this quote describes, they apply.',
] as const;

export const REWORK_WORDS: Record<string, string> = {
  added_suction_point: 'added suction point',
  sealed_opening: 'sealed opening',
  sealed_joint: 'sealed slab joint or crack',
  rerouted_pipe: 're-routed pipe',
  larger_fan: 'larger fan',
  other: 'other rework',
};

const dollars = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD', maximumFractionDigits: 0, minimumFractionDigits: 0 });

/** Whole cents as whole dollars, e.g. 12345600 → "$123,456". */
export function formatCents(cents: number): string {
  return dollars.format(Math.round(cents / 100));
}
