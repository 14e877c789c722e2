/// <reference lib="webworker" />
// Reads a chosen CSV file off the main thread, so a 20 MB file does not freeze the page: header row,
// the first rows for the preview, the number of rows, and the distinct values of each column (capped).
import Papa from 'papaparse';
import { detectDelimiter } from '@shared/domain/csv';
import type { ScanRequest, ScanMessage } from './scan-csv';

const PREVIEW_ROWS = 20;
const DISTINCT_CAP = 300;

self.onmessage = async (event: MessageEvent<ScanRequest>) => {
  const { file } = event.data;
  const post = (m: ScanMessage) => (self as unknown as Worker).postMessage(m);
  try {
    const delimiter = detectDelimiter(await file.slice(0, 64 * 1024).text());
    let headers: string[] | null = null;
    const preview: { row: number; cells: string[] }[] = [];
    let record = 0;
    let rows = 0;
    let distinct: Map<string, number>[] = [];
    let overflow: boolean[] = [];
    Papa.parse<string[]>(file, {
      delimiter,
      skipEmptyLines: false,
      chunkSize: 1024 * 1024,
      chunk(results) {
        for (const cells of results.data) {
          record++;
          if (record === 1) {
            headers = cells.map((c, i) => (i === 0 ? c.replace(/^\uFEFF/, '') : c).trim());
            distinct = headers.map(() => new Map());
            overflow = headers.map(() => false);
            continue;
          }
          if (cells.every((c) => c.trim() === '')) continue;
          rows++;
          if (preview.length < PREVIEW_ROWS) preview.push({ row: record, cells });
          for (let i = 0; i < distinct.length; i++) {
            const v = (cells[i] ?? '').trim();
            if (!v || overflow[i]) continue;
            const seen = distinct[i];
            seen.set(v, (seen.get(v) ?? 0) + 1);
            if (seen.size > DISTINCT_CAP) overflow[i] = true;
          }
        }
        post({ type: 'progress', bytes: Math.min(file.size, results.meta.cursor), rows });
      },
      complete() {
        post({
          type: 'done',
          result: {
            delimiter,
            headers: headers ?? [],
            preview,
            rows,
            distinct: distinct.map((m, i) => (overflow[i] ? null : [...m.entries()].map(([value, count]) => ({ value, count })))),
          },
        });
      },
      error(err) {
        post({ type: 'error', message: err.message });
      },
    });
  } catch (err) {
    post({ type: 'error', message: err instanceof Error ? err.message : String(err) });
  }
};
