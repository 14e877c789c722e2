import type { Delimiter } from '@shared/schemas/imports';

export interface ScanRequest {
  file: File;
}

export interface ScanResult {
  delimiter: Delimiter;
  headers: string[];
  /** The first data rows with their spreadsheet row numbers (header = row 1). */
  preview: { row: number; cells: string[] }[];
  rows: number;
  /** Per column: its distinct values with counts, or null when there are too many to list. */
  distinct: ({ value: string; count: number }[] | null)[];
}

export type ScanMessage = { type: 'progress'; bytes: number; rows: number } | { type: 'done'; result: ScanResult } | { type: 'error'; message: string };

/** Scans a file in a Web Worker; `onProgress` gets bytes read and rows counted so far. */
export function scanCsv(file: File, onProgress: (p: { bytes: number; rows: number }) => void): { promise: Promise<ScanResult>; cancel(): void } {
  const worker = new Worker(new URL('./scan-csv.worker.ts', import.meta.url), { type: 'module' });
  const promise = new Promise<ScanResult>((resolve, reject) => {
    worker.onmessage = (e: MessageEvent<ScanMessage>) => {
      if (e.data.type === 'progress') onProgress(e.data);
      else if (e.data.type === 'done') {
        resolve(e.data.result);
        worker.terminate();
      } else {
        reject(new Error(`Could not read the file: ${e.data.message}`));
        worker.terminate();
      }
    };
    worker.onerror = (e) => {
      reject(new Error(`Could not read the file: ${e.message}`));
      worker.terminate();
    };
  });
  worker.postMessage({ file } satisfies ScanRequest);
  return { promise, cancel: () => worker.terminate() };
}
