import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { detectDelimiter, guessMapping, headerKey, neutraliseCell, toSafeCsv } from './csv';

describe('delimiter detection', () => {
  it('reads comma, semicolon, tab and pipe files from their header record', () => {
    expect(detectDelimiter('Address,City,State,ZIP\n1 A St,X,ZZ,00090')).toBe(',');
    expect(detectDelimiter('Address;City;State;ZIP\n1 A St;X;ZZ;00090')).toBe(';');
    expect(detectDelimiter('Address\tCity\tState\tZIP\n')).toBe('\t');
    expect(detectDelimiter('Address|City|State|ZIP')).toBe('|');
  });

  it('is not fooled by commas in the data of a semicolon file (comma-decimal locales)', () => {
    // Spreadsheets in comma-decimal locales export ";" files with "41,18" in the cells (common practice).
    expect(detectDelimiter('\uFEFFAdresse;Ort;Lat;Lon\n"1 A St, Apt 2";X;41,18;-96,62\n')).toBe(';');
  });

  it('ignores delimiters inside quoted header cells (RFC 4180 §2.6)', () => {
    expect(detectDelimiter('"Street; or road";"City, town";ZIP\n')).toBe(';');
  });

  it('falls back to comma for a one-column file', () => {
    expect(detectDelimiter('Address\n1 A St\n')).toBe(',');
  });
});

describe('header guessing', () => {
  it('maps the usual spellings of county and builder lists', () => {
    const headers = ['Site Address', 'Apt', 'City', 'ST', 'Zip Code', 'Lat', 'Long', 'Year Built', 'Builder', 'Subdivision', 'Foundation Type', 'Owner Name', 'Mailing Address', 'DNC'];
    expect(guessMapping(headers)).toEqual({
      address: 'Site Address',
      unit: 'Apt',
      city: 'City',
      state: 'ST',
      zip: 'Zip Code',
      latitude: 'Lat',
      longitude: 'Long',
      yearBuilt: 'Year Built',
      builder: 'Builder',
      community: 'Subdivision',
      foundation: 'Foundation Type',
      ownerName: 'Owner Name',
      mailingAddress: 'Mailing Address',
      doNotContact: 'DNC',
    });
  });

  it('uses each column once and leaves unknown columns unmapped', () => {
    const m = guessMapping(['House Number', 'Street', 'Town', 'Postal Code', 'Parcel ID', 'State']);
    expect(m).toEqual({ houseNumber: 'House Number', address: 'Street', city: 'Town', zip: 'Postal Code', state: 'State' });
  });

  it('maps latitude and longitude only as a pair', () => {
    expect(guessMapping(['Address', 'Latitude'])).toEqual({ address: 'Address' });
  });

  it('keys remembered mappings by header text regardless of case, spacing and a BOM', () => {
    expect(headerKey(['\uFEFFZip Code', 'City '])).toBe(headerKey(['zip_code', 'CITY']));
    expect(headerKey(['Zip', 'City'])).not.toBe(headerKey(['City', 'Zip']));
  });
});

describe('formula injection (OWASP "CSV Injection")', () => {
  // OWASP's guidance: cells beginning with = + - @ tab or carriage return get a leading single quote
  // so spreadsheet software treats them as text; fields are quoted and embedded quotes doubled.
  it.each(['=1+2', '+1+2', '-2+3', '@SUM(A1:A2)', '=HYPERLINK("http://x.invalid","click")', '\t=1', '\r=1'])('neutralises %j', (cell) => {
    expect(neutraliseCell(cell)).toBe(`'${cell}`);
  });

  it('leaves ordinary text and plain numbers alone, so negative coordinates survive a round trip', () => {
    expect(neutraliseCell('Oak St')).toBe('Oak St');
    expect(neutraliseCell('-96.620153')).toBe('-96.620153');
    expect(neutraliseCell('+41.18')).toBe('+41.18');
    expect(neutraliseCell('')).toBe('');
  });

  it('writes RFC 4180 CSV that parses back to the neutralised cells', () => {
    const csv = toSafeCsv([
      ['Row', 'Owner', 'Note'],
      ['3', '=cmd|\' /C calc\'!A0', 'said "hi", then left\nnext line'],
    ]);
    expect(csv.split('\r\n')[0]).toBe('"Row","Owner","Note"');
    const back = Papa.parse<string[]>(csv).data;
    expect(back[1]).toEqual(['3', "'=cmd|' /C calc'!A0", 'said "hi", then left\nnext line']);
  });
});
