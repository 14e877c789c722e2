/**
 * The CSV batch protocol of public street-range geocoders: the request is a CSV file of
 * `id,street,city,state,zip` lines POSTed as the multipart field `addressFile`; each answer line is
 * `"id","input","Match"|"No_Match"|"Tie","Exact"|"Non_Exact","matched address","lon,lat","line id","L"|"R"`
 * (fields after the status only on a match). Both the HTTP client and the local fake speak it.
 */
import Papa from 'papaparse';

export interface GeocodeRequest {
  id: string;
  street: string;
  city: string;
  state: string;
  zip: string;
}

export type GeocodeOutcome =
  | { kind: 'match'; exact: boolean; matchedAddress: string; lon: number; lat: number }
  | { kind: 'no_match' }
  | { kind: 'tie' };

/** The request file: no header line, one address per line. */
export function formatBatchRequest(rows: readonly GeocodeRequest[]): string {
  return Papa.unparse(
    rows.map((r) => [r.id, r.street, r.city, r.state, r.zip]),
    { newline: '\n' },
  );
}

export function parseBatchRequest(text: string): GeocodeRequest[] {
  const { data } = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' });
  return data.map((cells) => ({
    id: (cells[0] ?? '').trim(),
    street: (cells[1] ?? '').trim(),
    city: (cells[2] ?? '').trim(),
    state: (cells[3] ?? '').trim(),
    zip: (cells[4] ?? '').trim(),
  }));
}

export interface AnswerLine {
  id: string;
  input: string;
  outcome: GeocodeOutcome;
  lineId?: string;
  side?: 'L' | 'R';
}

export function formatBatchAnswer(lines: readonly AnswerLine[]): string {
  const rows = lines.map((l) => {
    const o = l.outcome;
    if (o.kind === 'match') {
      return [l.id, l.input, 'Match', o.exact ? 'Exact' : 'Non_Exact', o.matchedAddress, `${o.lon.toFixed(6)},${o.lat.toFixed(6)}`, l.lineId ?? '', l.side ?? ''];
    }
    return [l.id, l.input, o.kind === 'tie' ? 'Tie' : 'No_Match'];
  });
  return Papa.unparse(rows, { quotes: true, newline: '\n' });
}

/** Answer lines by id. A line this parser cannot read counts as no match: nothing is placed on a guess. */
export function parseBatchAnswer(text: string): Map<string, GeocodeOutcome> {
  const { data } = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' });
  const out = new Map<string, GeocodeOutcome>();
  for (const cells of data) {
    const id = (cells[0] ?? '').trim();
    if (!id) continue;
    const status = (cells[2] ?? '').trim();
    if (status === 'Match') {
      const [lonText, latText] = (cells[5] ?? '').split(',');
      const lon = Number(lonText);
      const lat = Number(latText);
      if (!Number.isFinite(lon) || !Number.isFinite(lat) || Math.abs(lon) > 180 || Math.abs(lat) > 90) {
        out.set(id, { kind: 'no_match' });
        continue;
      }
      out.set(id, { kind: 'match', exact: (cells[3] ?? '').trim() === 'Exact', matchedAddress: (cells[4] ?? '').trim(), lon, lat });
    } else if (status === 'Tie') {
      out.set(id, { kind: 'tie' });
    } else {
      out.set(id, { kind: 'no_match' });
    }
  }
  return out;
}
