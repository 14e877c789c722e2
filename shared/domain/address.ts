/**
 * Address normalisation for matching one home across imports and edits.
 * Street suffixes and directionals follow USPS Publication 28 (Appendix C1 street suffixes,
 * §233.3 directionals); only the common suffixes are listed here.
 */
const SUFFIXES: Record<string, string> = {
  ALLEY: 'ALY', AVENUE: 'AVE', AV: 'AVE', AVEN: 'AVE', BEND: 'BND', BOULEVARD: 'BLVD', BOUL: 'BLVD', CIRCLE: 'CIR', CIRC: 'CIR',
  COURT: 'CT', COVE: 'CV', CREEK: 'CRK', CROSSING: 'XING', DRIVE: 'DR', DRV: 'DR', EXPRESSWAY: 'EXPY', GLEN: 'GLN',
  HEIGHTS: 'HTS', HIGHWAY: 'HWY', HILL: 'HL', HOLLOW: 'HOLW', LANE: 'LN', LOOP: 'LOOP', MEADOW: 'MDW', MEADOWS: 'MDWS',
  PARKWAY: 'PKWY', PASS: 'PASS', PATH: 'PATH', PLACE: 'PL', POINT: 'PT', RIDGE: 'RDG', ROAD: 'RD', RUN: 'RUN',
  SQUARE: 'SQ', STREET: 'ST', STR: 'ST', TERRACE: 'TER', TRAIL: 'TRL', TRAILS: 'TRL', TRACE: 'TRCE', VIEW: 'VW', WAY: 'WAY',
};
const DIRECTIONALS: Record<string, string> = {
  NORTH: 'N', SOUTH: 'S', EAST: 'E', WEST: 'W', NORTHEAST: 'NE', NORTHWEST: 'NW', SOUTHEAST: 'SE', SOUTHWEST: 'SW',
};

/** Upper-cases, strips punctuation and abbreviates suffixes/directionals: "123 North Oak Street" → "123 N OAK ST". */
export function normaliseStreet(street: string): string {
  const words = street
    .toUpperCase()
    .replace(/[.,#]/g, ' ')
    .split(/\s+/)
    .filter(Boolean);
  return words
    .map((w, i) => {
      if (DIRECTIONALS[w] && (i === 0 || i === words.length - 1)) return DIRECTIONALS[w];
      if (i === words.length - 1 || (i === words.length - 2 && DIRECTIONALS[words[words.length - 1]])) return SUFFIXES[w] ?? w;
      return w;
    })
    .join(' ');
}

/** The key that identifies one address within a company: number, street, unit and 5-digit ZIP. */
export function addressKey(a: { number: string; street: string; unit?: string | null; zip: string }): string {
  const unit = (a.unit ?? '').toUpperCase().replace(/^(APT|UNIT|STE|#)\s*/, '').trim();
  return [a.number.trim().toUpperCase(), normaliseStreet(a.street), unit, a.zip.trim().slice(0, 5)].join('|');
}

export function formatAddress(a: { number: string; street: string; unit?: string | null }): string {
  return `${a.number} ${a.street}${a.unit ? ` #${a.unit}` : ''}`;
}
