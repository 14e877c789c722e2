/**
 * CSV helpers shared by the import page (browser) and the import service (server): delimiter
 * detection, header guessing for the column mapping, and formula-injection-safe export.
 */
import Papa from 'papaparse';
import { DELIMITERS, IMPORT_FIELDS, type ColumnMapping, type Delimiter, type ImportField } from '../schemas/imports.js';

const BOM = '\uFEFF';

export function stripBom(text: string): string {
  return text.startsWith(BOM) ? text.slice(1) : text;
}

/**
 * The delimiter of a CSV sample: the candidate (`,` `;` tab `|`) that splits the header record into the
 * most fields, counting only outside quotes. The header is the most regular line of a file, and
 * spreadsheets in comma-decimal locales write `;` files whose data cells contain commas.
 * Ties go to the earlier candidate (comma first); a single-column file is comma-separated.
 */
export function detectDelimiter(sample: string): Delimiter {
  const text = stripBom(sample);
  const counts = new Map<Delimiter, number>(DELIMITERS.map((d) => [d, 0]));
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"') {
      // A doubled quote inside a quoted field is an escaped quote (RFC 4180 §2.7).
      if (quoted && text[i + 1] === '"') i++;
      else quoted = !quoted;
    } else if (!quoted && (ch === '\n' || ch === '\r')) {
      break;
    } else if (!quoted && counts.has(ch as Delimiter)) {
      counts.set(ch as Delimiter, counts.get(ch as Delimiter)! + 1);
    }
  }
  let best: Delimiter = ',';
  for (const d of DELIMITERS) if (counts.get(d)! > counts.get(best)!) best = d;
  return best;
}

/** Header text reduced for comparison: lower case, letters and digits only ("Year Built" → "yearbuilt"). */
export function normaliseHeader(header: string): string {
  return stripBom(header).toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** The key under which a company's mapping for "a file with these headers" is remembered. */
export function headerKey(headers: readonly string[]): string {
  return headers.map(normaliseHeader).join('|');
}

/** Header spellings seen in county parcel exports, builders' lot lists and HOA rosters (common practice). */
const SYNONYMS: Record<ImportField, string[]> = {
  address: ['address', 'streetaddress', 'address1', 'addressline1', 'addr', 'siteaddress', 'situsaddress', 'propertyaddress', 'street', 'location', 'homeaddress', 'fulladdress'],
  houseNumber: ['housenumber', 'houseno', 'streetnumber', 'streetno', 'number', 'addressnumber', 'housenum'],
  unit: ['unit', 'apt', 'apartment', 'suite', 'unitnumber', 'aptnumber', 'address2', 'addressline2'],
  city: ['city', 'town', 'municipality', 'sitecity', 'situscity', 'propertycity'],
  state: ['state', 'st', 'statecode', 'province', 'sitestate'],
  zip: ['zip', 'zipcode', 'zip5', 'postalcode', 'postcode', 'sitezip', 'situszip'],
  latitude: ['latitude', 'lat', 'y', 'ycoord', 'latdd'],
  longitude: ['longitude', 'lon', 'lng', 'long', 'x', 'xcoord', 'londd'],
  yearBuilt: ['yearbuilt', 'yrbuilt', 'built', 'yearconstructed', 'constructionyear', 'year', 'effyearbuilt'],
  builder: ['builder', 'buildername', 'homebuilder', 'contractor', 'developer'],
  community: ['community', 'subdivision', 'neighborhood', 'neighbourhood', 'development', 'phase', 'hoa', 'subdivisionname'],
  foundation: ['foundation', 'foundationtype', 'basement', 'foundationkind'],
  ownerName: ['owner', 'ownername', 'homeowner', 'occupant', 'resident', 'name', 'owner1'],
  mailingAddress: ['mailingaddress', 'mailaddress', 'owneraddress', 'mailing', 'ownermailingaddress'],
  doNotContact: ['donotcontact', 'dnc', 'donotmail', 'nocontact', 'optout', 'donotcall'],
};

/**
 * A first guess at the mapping: exact synonyms first, then a header that contains a longer synonym
 * ("Site Address (Primary)"). Each column is used at most once.
 */
export function guessMapping(headers: readonly string[]): ColumnMapping {
  const normalised = headers.map(normaliseHeader);
  const used = new Set<number>();
  const mapping: ColumnMapping = {};
  const take = (field: ImportField, index: number) => {
    mapping[field] = headers[index];
    used.add(index);
  };
  for (const field of IMPORT_FIELDS) {
    const index = normalised.findIndex((h, i) => !used.has(i) && SYNONYMS[field].includes(h));
    if (index >= 0) take(field, index);
  }
  for (const field of IMPORT_FIELDS) {
    if (mapping[field]) continue;
    const index = normalised.findIndex((h, i) => !used.has(i) && SYNONYMS[field].some((s) => s.length >= 5 && h.includes(s)));
    if (index >= 0) take(field, index);
  }
  // Coordinates only make sense as a pair.
  if (!mapping.latitude !== !mapping.longitude) {
    delete mapping.latitude;
    delete mapping.longitude;
  }
  return mapping;
}

const FORMULA_TRIGGERS = new Set(['=', '+', '-', '@', '\t', '\r', '\n']);
const PLAIN_NUMBER = /^[-+]?(\d+([.,]\d+)?|[.,]\d+)$/;

/**
 * Makes a cell safe to open in a spreadsheet (OWASP "CSV Injection"): a value starting with
 * `=`, `+`, `-`, `@`, tab or carriage return is prefixed with a single quote so the spreadsheet shows it as
 * text instead of evaluating it. A plain number such as `-96.62` cannot be a formula and stays as it is,
 * so coordinates survive a round trip.
 */
export function neutraliseCell(value: string): string {
  if (value === '' || !FORMULA_TRIGGERS.has(value[0])) return value;
  if (PLAIN_NUMBER.test(value)) return value;
  return `'${value}`;
}

/** RFC 4180 CSV (every field quoted, CRLF line ends) with every cell neutralised for spreadsheets. */
export function toSafeCsv(rows: readonly (readonly string[])[], delimiter: Delimiter = ','): string {
  return Papa.unparse(
    rows.map((r) => r.map((c) => neutraliseCell(c ?? ''))),
    { quotes: true, delimiter, newline: '\r\n' },
  );
}
