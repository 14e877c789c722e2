import { describe, expect, it } from 'vitest';
import { readImportRow, resolveColumns } from './imports';

const headers = ['Address', 'City', 'State', 'ZIP', 'Lat', 'Lon', 'Year Built', 'Foundation', 'Owner', 'DNC', 'Unit'];
const { columns } = resolveColumns(headers, {
  address: 'Address', city: 'City', state: 'State', zip: 'ZIP', latitude: 'Lat', longitude: 'Lon',
  yearBuilt: 'Year Built', foundation: 'Foundation', ownerName: 'Owner', doNotContact: 'DNC', unit: 'Unit',
});
const ctx = { currentYear: 2026 };
const row = (over: Partial<Record<string, string>> = {}) =>
  headers.map((h) => over[h] ?? ({ Address: '401 sedgefield drive', City: 'TARROWBY', State: 'zz', ZIP: '90', Lat: '', Lon: '', 'Year Built': '2015', Foundation: 'Slab on grade', Owner: '', DNC: '', Unit: '' } as Record<string, string>)[h]);

describe('import row checks', () => {
  it('normalises a good row the way it will be saved', () => {
    const r = readImportRow(row(), columns, 2, ctx);
    expect(r.blank).toBe(false);
    if (r.blank) return;
    expect(r.errors).toEqual([]);
    expect(r.candidate).toMatchObject({
      row: 2, number: '401', street: 'Sedgefield Dr', city: 'Tarrowby', state: 'ZZ',
      // A spreadsheet turns ZIP 00090 into 90; padded back (common practice).
      zip: '00090', addressKey: '401|SEDGEFIELD DR||00090', lon: null, lat: null, yearBuilt: 2015, foundation: 'slab',
      ownerName: null, doNotContact: null,
    });
  });

  it('names row, column and reason for each problem', () => {
    const r = readImportRow(row({ ZIP: 'ABCDE', 'Year Built': '3020', Lat: '41.1', Lon: '', DNC: 'maybe', Foundation: 'stilts' }), columns, 7, ctx);
    if (r.blank) throw new Error('not blank');
    expect(r.candidate).toBeNull();
    expect(r.errors).toEqual([
      { row: 7, field: 'ZIP', reason: '"ABCDE" is not a 5-digit ZIP or ZIP+4' },
      { row: 7, field: 'Lon', reason: 'the longitude is empty but the latitude is not' },
      { row: 7, field: 'Year Built', reason: '3020 is outside 1800–2027' },
      { row: 7, field: 'Foundation', reason: '"stilts" is not one of slab, basement, crawlspace, mixed' },
      { row: 7, field: 'DNC', reason: '"maybe" is not yes or no' },
    ]);
  });

  it('refuses coordinates out of range and the 0, 0 placeholder', () => {
    const bad = readImportRow(row({ Lat: '95', Lon: '-200' }), columns, 3, ctx);
    if (bad.blank) throw new Error('not blank');
    expect(bad.errors.map((e) => e.field)).toEqual(['Lat', 'Lon']);
    const zero = readImportRow(row({ Lat: '0', Lon: '0' }), columns, 3, ctx);
    if (zero.blank) throw new Error('not blank');
    expect(zero.errors[0].reason).toMatch(/missing, not zero/);
  });

  it('reads comma-decimal coordinates and keeps formula-like text as text', () => {
    const r = readImportRow(row({ Lat: '41,178', Lon: '-96,625', Owner: '=HYPERLINK("x")', Unit: 'Apt 4' }), columns, 4, ctx);
    if (r.blank || !r.candidate) throw new Error('expected a candidate');
    expect([r.candidate.lat, r.candidate.lon]).toEqual([41.178, -96.625]);
    expect(r.candidate.ownerName).toBe('=HYPERLINK("x")');
    expect(r.candidate.unit).toBe('4');
  });

  it('skips an entirely blank line', () => {
    expect(readImportRow(headers.map(() => ' '), columns, 5, ctx)).toEqual({ blank: true });
  });
});

describe('column mapping', () => {
  it('names the required fields that have no column and the mapped columns the file lacks', () => {
    const { problems } = resolveColumns(['Address', 'State'], { address: 'Address', state: 'State', community: 'Subdivision' });
    expect(problems).toEqual([
      { field: 'city', message: 'no column for City (required)' },
      { field: 'zip', message: 'no column for ZIP (required)' },
      { field: 'community', message: 'the file has no column "Subdivision" (mapped to Community)' },
    ]);
  });

  it('refuses an ambiguous header', () => {
    const { problems } = resolveColumns(['Address', 'City', 'City', 'State', 'ZIP'], { address: 'Address', city: 'City', state: 'State', zip: 'ZIP' });
    expect(problems).toEqual([{ field: 'city', message: 'the header row has 2 columns named "City"; rename them so each is unique' }]);
  });
});
