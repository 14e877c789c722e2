/**
 * One CSV row → one home candidate: the checks and normalisation every import row goes through,
 * shared by the import page's preview (browser) and the import service (server) so the preview shows
 * exactly what will be saved.
 */
import { FOUNDATIONS, type Foundation } from '../schemas/enums.js';
import {
  IMPORT_FIELDS,
  IMPORT_FIELD_LABELS,
  REQUIRED_IMPORT_FIELDS,
  type ColumnMapping,
  type ImportField,
  type RowError,
} from '../schemas/imports.js';
import { addressKey, parseStreetLine } from './address.js';
import { normaliseHeader } from './csv.js';

export interface ResolvedColumn {
  index: number;
  header: string;
}
export type ResolvedColumns = Partial<Record<ImportField, ResolvedColumn>>;

export interface MappingProblem {
  field: string;
  message: string;
}

/**
 * Finds each mapped column in the header row. Problems name the columns: a required field with no
 * column, a mapped header the file lacks, a header that appears twice, one column mapped twice.
 */
export function resolveColumns(headers: readonly string[], mapping: ColumnMapping): { columns: ResolvedColumns; problems: MappingProblem[] } {
  const columns: ResolvedColumns = {};
  const problems: MappingProblem[] = [];
  const missingRequired = REQUIRED_IMPORT_FIELDS.filter((f) => !mapping[f]);
  if (missingRequired.length) {
    for (const f of missingRequired) problems.push({ field: f, message: `no column for ${IMPORT_FIELD_LABELS[f]} (required)` });
  }
  const usedBy = new Map<number, ImportField>();
  for (const field of IMPORT_FIELDS) {
    const header = mapping[field];
    if (!header) continue;
    const wanted = normaliseHeader(header);
    const exact = headers.flatMap((h, i) => (h.trim() === header.trim() ? [i] : []));
    const matches = exact.length ? exact : headers.flatMap((h, i) => (normaliseHeader(h) === wanted ? [i] : []));
    if (matches.length === 0) {
      problems.push({ field, message: `the file has no column "${header}" (mapped to ${IMPORT_FIELD_LABELS[field]})` });
    } else if (matches.length > 1) {
      problems.push({ field, message: `the header row has ${matches.length} columns named "${header}"; rename them so each is unique` });
    } else if (usedBy.has(matches[0])) {
      problems.push({ field, message: `column "${header}" is already mapped to ${IMPORT_FIELD_LABELS[usedBy.get(matches[0])!]}` });
    } else {
      usedBy.set(matches[0], field);
      columns[field] = { index: matches[0], header: headers[matches[0]] };
    }
  }
  return { columns, problems };
}

/** A valid row as it will be saved. `null` means "the file does not say": an update keeps the stored value. */
export interface ImportCandidate {
  row: number;
  number: string;
  street: string;
  unit: string | null;
  city: string;
  state: string;
  zip: string;
  addressKey: string;
  lon: number | null;
  lat: number | null;
  yearBuilt: number | null;
  builder: string | null;
  community: string | null;
  foundation: Foundation | null;
  ownerName: string | null;
  mailingAddress: string | null;
  doNotContact: boolean | null;
}

export interface RowContext {
  /** Years after this one are refused (a home cannot be built in the future; next year's permits are fine). */
  currentYear: number;
}

export type RowResult = { blank: true } | { blank: false; candidate: ImportCandidate | null; errors: RowError[] };

// Control characters other than tab/newline never belong in an address book.
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/g;
/** True when oneLine would change `s`: control characters, line breaks, doubled or outer spaces. */
function needsCleaning(s: string): boolean {
  const n = s.length;
  if (n === 0) return false;
  const first = s.charCodeAt(0);
  const last = s.charCodeAt(n - 1);
  if (first <= 32 || last <= 32 || first === 160 || last === 160) return true;
  let prevSpace = false;
  for (let i = 1; i < n - 1; i++) {
    const c = s.charCodeAt(i);
    if (c < 32 || c === 127) return true;
    const space = c === 32 || c === 160;
    if (space && prevSpace) return true;
    prevSpace = space;
  }
  return false;
}
function oneLine(s: string): string {
  // Most cells are already clean: skip the two replacements (100,000-row files go through here).
  if (!needsCleaning(s)) return s;
  return s.replace(CONTROL, '').replace(/\s+/g, ' ').trim();
}
/** A leading apostrophe is how spreadsheets mark "text" (and how exports neutralise formulas): not part of a number. */
const numeric = (s: string) => oneLine(s).replace(/^'/, '');

function displayCase(s: string): string {
  if (s !== s.toUpperCase() && s !== s.toLowerCase()) return s;
  return s.toLowerCase().replace(/(^|[\s'-])([a-z])/g, (_m, sep: string, c: string) => sep + c.toUpperCase());
}

const FOUNDATION_WORDS: Record<string, Foundation> = {
  slab: 'slab', slabongrade: 'slab', slabongrad: 'slab', sog: 'slab', monolithicslab: 'slab',
  basement: 'basement', fullbasement: 'basement', walkout: 'basement', walkoutbasement: 'basement', bsmt: 'basement', daylightbasement: 'basement',
  crawlspace: 'crawlspace', crawl: 'crawlspace', crawlspaces: 'crawlspace',
  mixed: 'mixed', combination: 'mixed', split: 'mixed', basementandslab: 'mixed', slabandcrawlspace: 'mixed', basementandcrawlspace: 'mixed',
};
const YES = new Set(['yes', 'y', 'true', 't', '1', 'x', 'dnc', 'donotcontact']);
const NO = new Set(['no', 'n', 'false', 'f', '0']);

function parseCoordinate(raw: string): number | null {
  const s = numeric(raw);
  // Comma-decimal spreadsheets write "41,18" (the file's delimiter is then ";" or tab).
  const normalised = /^[-+]?\d+,\d+$/.test(s) ? s.replace(',', '.') : s;
  if (!/^[-+]?(\d+(\.\d*)?|\.\d+)$/.test(normalised)) return null;
  return Number(normalised);
}

function failOn(errors: RowError[], columns: ResolvedColumns, row: number, f: ImportField, reason: string) {
  errors.push({ row, field: columns[f]?.header ?? IMPORT_FIELD_LABELS[f], reason });
}

function cellOf(cells: readonly string[], columns: ResolvedColumns, f: ImportField): string {
  const c = columns[f];
  return c ? (cells[c.index] ?? '') : '';
}

/**
 * Checks and normalises one data row. `row` is the spreadsheet row number (the header is row 1).
 * Errors name the file's column header as the field.
 */
export function readImportRow(cells: readonly string[], columns: ResolvedColumns, row: number, ctx: RowContext): RowResult {
  let blank = true;
  for (let i = 0; i < cells.length; i++) {
    if (cells[i].trim() !== '') {
      blank = false;
      break;
    }
  }
  if (blank) return { blank: true };

  const errors: RowError[] = [];

  // Address: "123 N Oak St Apt 4", or a house-number column plus a street column.
  const houseNumber = oneLine(cellOf(cells, columns, 'houseNumber'));
  const streetCell = oneLine(cellOf(cells, columns, 'address'));
  const line = houseNumber ? `${houseNumber} ${streetCell}` : streetCell;
  let parsed: ReturnType<typeof parseStreetLine> = null;
  if (!streetCell) {
    failOn(errors, columns, row, 'address', 'the street address is empty');
  } else {
    parsed = parseStreetLine(line);
    if (!parsed) failOn(errors, columns, row, houseNumber ? 'houseNumber' : 'address', `no house number and street in "${line}"`);
    else if (parsed.number.length > 12) failOn(errors, columns, row, 'address', 'the house number is longer than 12 characters');
    else if (parsed.street.length > 120) failOn(errors, columns, row, 'address', 'the street name is longer than 120 characters');
  }
  const unitCell = oneLine(cellOf(cells, columns, 'unit')).replace(/^(APT|APARTMENT|UNIT|STE|SUITE|#)\.?\s*#?\s*/i, '');
  const unit = unitCell ? unitCell.toUpperCase() : (parsed?.unit ?? null);
  if (unit && unit.length > 20) failOn(errors, columns, row, 'unit', 'the unit is longer than 20 characters');

  const city = displayCase(oneLine(cellOf(cells, columns, 'city')));
  if (!city) failOn(errors, columns, row, 'city', 'the city is empty');
  else if (city.length > 80) failOn(errors, columns, row, 'city', 'the city is longer than 80 characters');

  const stateRaw = oneLine(cellOf(cells, columns, 'state'));
  if (!stateRaw) failOn(errors, columns, row, 'state', 'the state is empty');
  else if (!/^[A-Za-z]{2}$/.test(stateRaw)) failOn(errors, columns, row, 'state', `"${stateRaw}" is not a two-letter state code`);
  const state = stateRaw.toUpperCase();

  // Spreadsheets drop a ZIP's leading zeros ("00090" → "90"): a numeric ZIP of 1–4 digits is padded back (common practice).
  let zip = numeric(cellOf(cells, columns, 'zip'));
  if (/^\d{1,4}$/.test(zip)) zip = zip.padStart(5, '0');
  else if (/^\d{9}$/.test(zip)) zip = `${zip.slice(0, 5)}-${zip.slice(5)}`;
  if (!zip) failOn(errors, columns, row, 'zip', 'the ZIP is empty');
  else if (!/^\d{5}(-\d{4})?$/.test(zip)) failOn(errors, columns, row, 'zip', `"${zip}" is not a 5-digit ZIP or ZIP+4`);

  let lon: number | null = null;
  let lat: number | null = null;
  if (columns.latitude && columns.longitude) {
    const latRaw = numeric(cellOf(cells, columns, 'latitude'));
    const lonRaw = numeric(cellOf(cells, columns, 'longitude'));
    if (latRaw || lonRaw) {
      if (!latRaw) failOn(errors, columns, row, 'latitude', 'the latitude is empty but the longitude is not');
      else if (!lonRaw) failOn(errors, columns, row, 'longitude', 'the longitude is empty but the latitude is not');
      else {
        lat = parseCoordinate(latRaw);
        lon = parseCoordinate(lonRaw);
        if (lat === null) failOn(errors, columns, row, 'latitude', `"${latRaw}" is not a number`);
        else if (lat < -90 || lat > 90) failOn(errors, columns, row, 'latitude', `${lat} is outside −90…90`);
        if (lon === null) failOn(errors, columns, row, 'longitude', `"${lonRaw}" is not a number`);
        else if (lon < -180 || lon > 180) failOn(errors, columns, row, 'longitude', `${lon} is outside −180…180`);
        if (lat === 0 && lon === 0) failOn(errors, columns, row, 'latitude', '0, 0 is in the Atlantic Ocean: the coordinates are missing, not zero');
      }
    }
  }

  let yearBuilt: number | null = null;
  const yearRaw = numeric(cellOf(cells, columns, 'yearBuilt'));
  if (yearRaw) {
    if (!/^\d{4}(\.0+)?$/.test(yearRaw)) failOn(errors, columns, row, 'yearBuilt', `"${yearRaw}" is not a four-digit year`);
    else {
      yearBuilt = Number.parseInt(yearRaw, 10);
      if (yearBuilt < 1800 || yearBuilt > ctx.currentYear + 1) failOn(errors, columns, row, 'yearBuilt', `${yearBuilt} is outside 1800–${ctx.currentYear + 1}`);
    }
  }

  const builder = oneLine(cellOf(cells, columns, 'builder')) || null;
  if (builder && builder.length > 120) failOn(errors, columns, row, 'builder', 'the builder name is longer than 120 characters');
  const community = oneLine(cellOf(cells, columns, 'community')) || null;
  if (community && community.length > 120) failOn(errors, columns, row, 'community', 'the community name is longer than 120 characters');

  let foundation: Foundation | null = null;
  const foundationRaw = oneLine(cellOf(cells, columns, 'foundation'));
  if (foundationRaw) {
    foundation = FOUNDATION_WORDS[foundationRaw.toLowerCase().replace(/[^a-z]/g, '')] ?? null;
    if (!foundation) failOn(errors, columns, row, 'foundation', `"${foundationRaw}" is not one of ${FOUNDATIONS.join(', ')}`);
  }

  const ownerName = oneLine(cellOf(cells, columns, 'ownerName')) || null;
  if (ownerName && ownerName.length > 160) failOn(errors, columns, row, 'ownerName', 'the owner name is longer than 160 characters');
  const mailingAddress = oneLine(cellOf(cells, columns, 'mailingAddress')) || null;
  if (mailingAddress && mailingAddress.length > 400) failOn(errors, columns, row, 'mailingAddress', 'the mailing address is longer than 400 characters');

  let doNotContact: boolean | null = null;
  const dncRaw = oneLine(cellOf(cells, columns, 'doNotContact')).toLowerCase();
  if (dncRaw) {
    if (YES.has(dncRaw)) doNotContact = true;
    else if (NO.has(dncRaw)) doNotContact = false;
    else failOn(errors, columns, row, 'doNotContact', `"${dncRaw}" is not yes or no`);
  }

  if (errors.length || !parsed) return { blank: false, candidate: null, errors };
  return {
    blank: false,
    errors,
    candidate: {
      row,
      number: parsed.number,
      street: parsed.street,
      unit,
      city,
      state,
      zip,
      addressKey: addressKey({ number: parsed.number, street: parsed.street, unit, zip }),
      lon,
      lat,
      yearBuilt,
      builder,
      community,
      foundation,
      ownerName,
      mailingAddress,
      doNotContact,
    },
  };
}

/** The single line a geocoder is asked about: "123 N Oak St". */
export function geocodeLine(c: Pick<ImportCandidate, 'number' | 'street'>): string {
  return `${c.number} ${c.street}`;
}
