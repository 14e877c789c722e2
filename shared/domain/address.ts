/**
 * Address normalisation for matching one home across imports and edits.
 * Street suffixes and directionals follow USPS Publication 28 (Appendix C1 street suffixes,
 * §233 directionals, §234.2 two suffixes). The full suffix table comes from the `parse-address`
 * package; the short table below is the fallback for street lines that parser cannot account for
 * word by word (e.g. "Avenue of the Americas"), and it keeps the keys of stored homes as they were.
 */
import parseAddress from 'parse-address';

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

function legacyNormaliseStreet(street: string): string {
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

/** A street name in its parts, abbreviated per Pub 28: "North Oak Street" → { prefix: 'N', name: 'Oak', type: 'St' }. */
export interface StreetParts {
  prefix: string | null;
  name: string;
  type: string | null;
  suffix: string | null;
}

const cleanWords = (s: string) => s.replace(/[.,#]/g, ' ').replace(/\s+/g, ' ').trim();
const wordCount = (s: string | undefined | null) => (s ? s.split(' ').filter(Boolean).length : 0);

/** "MAPLE RIDGE" / "maple ridge" → "Maple Ridge"; mixed case ("McAllister") is kept as typed. */
function displayCase(words: string): string {
  if (words !== words.toUpperCase() && words !== words.toLowerCase()) return words;
  return words.toLowerCase().replace(/(^|[\s'-])([a-z])/g, (_m, sep: string, c: string) => sep + c.toUpperCase());
}

// Street names repeat thousands of times in one file: parse each distinct spelling once.
const partsCache = new Map<string, StreetParts | null>();
const CACHE_LIMIT = 50_000;

/**
 * The parts of a street name (no house number, no unit), or null when the parser would drop words
 * ("State Route 9", "Trails End"): such names are kept word for word rather than mangled.
 */
export function streetParts(street: string): StreetParts | null {
  const cleaned = cleanWords(street);
  const cached = partsCache.get(cleaned);
  if (cached !== undefined) return cached;
  let result: StreetParts | null = null;
  if (cleaned) {
    const parsed = parseAddress.parseInformalAddress(`1 ${cleaned}`);
    if (parsed?.street && !parsed.sec_unit_type && !parsed.city) {
      const accounted = wordCount(parsed.prefix) + wordCount(parsed.street) + wordCount(parsed.type) + wordCount(parsed.suffix);
      if (accounted === wordCount(cleaned)) {
        result = {
          prefix: parsed.prefix?.toUpperCase() ?? null,
          name: displayCase(parsed.street),
          type: parsed.type ?? null,
          suffix: parsed.suffix?.toUpperCase() ?? null,
        };
      }
    }
  }
  remember(partsCache, cleaned, result);
  return result;
}

/** The street as it is saved and shown: Pub 28 abbreviations, words otherwise as typed ("N Oak St"). */
export function displayStreet(street: string): string {
  let out = displayCache.get(street);
  if (out === undefined) {
    const parts = streetParts(street);
    out = parts ? [parts.prefix, parts.name, parts.type, parts.suffix].filter(Boolean).join(' ') : displayCase(cleanWords(street));
    remember(displayCache, street, out);
  }
  return out;
}

const displayCache = new Map<string, string>();
const keyCache = new Map<string, string>();
function remember<V>(cache: Map<string, V>, key: string, value: V) {
  if (cache.size >= CACHE_LIMIT) cache.clear();
  cache.set(key, value);
}

/**
 * Upper-cases, strips punctuation and abbreviates suffixes and directionals per USPS Pub 28:
 * "North Oak Street" → "N OAK ST"; "Kite Hollow Lane" → "KITE HOLLOW LN" (§234.2: of two suffix words
 * only the last is abbreviated).
 */
export function normaliseStreet(street: string): string {
  let out = keyCache.get(street);
  if (out === undefined) {
    const parts = streetParts(street);
    out = parts
      ? [parts.prefix, parts.name, parts.type, parts.suffix]
          .filter(Boolean)
          .join(' ')
          .toUpperCase()
          .replace(/\s+/g, ' ')
      : legacyNormaliseStreet(street);
    remember(keyCache, street, out);
  }
  return out;
}

export interface StreetLine {
  number: string;
  street: string;
  unit: string | null;
}

const HOUSE_NUMBER = /^(\d+[A-Za-z]?(?:-\d+[A-Za-z]?)?(?:\s+1\/2)?)\s+(.+)$/;
// Pub 28 Appendix C2 secondary unit designators (the common ones).
const UNIT_DESIGNATORS = new Set(['APT', 'APARTMENT', 'UNIT', 'STE', 'SUITE', 'LOT', 'BLDG', 'BUILDING', 'FL', 'FLOOR', 'RM', 'ROOM', 'SPC', 'SPACE', 'TRLR', 'DEPT']);
const UNIT_VALUE = /^#?([A-Za-z0-9][A-Za-z0-9-]*)$/;

/** Takes a trailing unit ("Apt 4", "Apt. #4", "# 4", "#4", ", Unit 3") off a street line. */
function splitUnit(line: string): { rest: string; unit: string | null } {
  const words = line.split(' ');
  if (words.length < 3) return { rest: line, unit: null };
  const last = words[words.length - 1];
  const before = words[words.length - 2].replace(/^,/, '').replace(/[.,]$/, '').toUpperCase();
  let cut = -1;
  let value: string | null = null;
  if (last.length > 1 && last[0] === '#' && UNIT_VALUE.test(last)) {
    cut = words.length - 1;
    value = last.slice(1);
    // "Apt #4": the designator goes too.
    if (UNIT_DESIGNATORS.has(before)) cut--;
  } else if ((before === '#' || UNIT_DESIGNATORS.has(before)) && UNIT_VALUE.test(last)) {
    cut = words.length - 2;
    value = last.replace(/^#/, '');
  }
  if (cut < 2 || value === null) return { rest: line, unit: null };
  return { rest: words.slice(0, cut).join(' ').replace(/,$/, ''), unit: value.toUpperCase() };
}

/**
 * Splits a street line into house number, street (display form) and unit:
 * "123 north oak street apt 4" → { number: '123', street: 'N Oak St', unit: '4' }. Null when there is no
 * leading house number or no street name.
 */
export function parseStreetLine(line: string): StreetLine | null {
  const { rest, unit } = splitUnit(line.replace(/\s+/g, ' ').trim());
  const numberMatch = HOUSE_NUMBER.exec(rest);
  if (!numberMatch) return null;
  const street = displayStreet(numberMatch[2].replace(/^,\s*/, ''));
  if (!street) return null;
  return { number: numberMatch[1].toUpperCase(), street, unit };
}

/** The key that identifies one address within a company: number, street, unit and 5-digit ZIP. */
export function addressKey(a: { number: string; street: string; unit?: string | null; zip: string }): string {
  const unit = (a.unit ?? '').toUpperCase().replace(/^(APT|UNIT|STE|#)\s*/, '').trim();
  return [a.number.trim().toUpperCase(), normaliseStreet(a.street), unit, a.zip.trim().slice(0, 5)].join('|');
}

export function formatAddress(a: { number: string; street: string; unit?: string | null }): string {
  return `${a.number} ${a.street}${a.unit ? ` #${a.unit}` : ''}`;
}
