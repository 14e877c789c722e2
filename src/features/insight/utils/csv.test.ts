import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { toSafeCsv } from './csv';

describe('toSafeCsv (OWASP CSV Injection: prefix a quote to cells starting with = + - @ tab CR)', () => {
  it('neutralises every formula trigger OWASP lists', () => {
    const triggers = ['=1+2', '+1+2', '-1+2', '@SUM(A1)', '\tcmd', '\rcmd'];
    const csv = toSafeCsv(['builder'], triggers.map((t) => [t]));
    const parsed = Papa.parse<string[]>(csv.trim(), { newline: '\r\n' }).data.slice(1).map((r) => r[0]);
    expect(parsed).toEqual(triggers.map((t) => `'${t}`));
  });

  it('leaves plain text and numbers alone, and quotes commas and quotes (RFC 4180)', () => {
    const csv = toSafeCsv(['builder', 'rate'], [['Ansel & Vary, Inc.', 0.25], ['The "Best" Homes', -0.5], [null, 3]]);
    expect(csv.split('\r\n')).toEqual(['builder,rate', '"Ansel & Vary, Inc.",0.25', '"The ""Best"" Homes",-0.5', ',3']);
  });
});
