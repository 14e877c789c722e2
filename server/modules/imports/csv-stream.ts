/**
 * Reads an uploaded CSV body as it arrives: UTF-8 decoded across chunk boundaries, BOM removed,
 * delimiter detected from the header record, records handed over one by one by papaparse (quoted
 * fields may hold delimiters and newlines). Size and row limits stop parsing with a clear error; the
 * rest of the body is still read (up to twice the size limit) so the client gets the answer, not a reset.
 */
import { Readable } from 'node:stream';
import { StringDecoder } from 'node:string_decoder';
import Papa from 'papaparse';
import { detectDelimiter } from '../../../shared/domain/csv.js';
import type { Delimiter } from '../../../shared/schemas/imports.js';

export class CsvLimitError extends Error {
  constructor(
    readonly limit: 'bytes' | 'rows',
    message: string,
  ) {
    super(message);
  }
}

export interface CsvStreamOptions {
  maxBytes: number;
  maxRows: number;
  delimiter?: Delimiter;
  /** Each record with its spreadsheet row number (the header is row 1). Return false to stop reading. */
  onRecord(cells: string[], row: number, problems: string[]): boolean | void;
}

const HEAD_BYTES = 64 * 1024;
const NO_PROBLEMS: string[] = [];

export async function readCsvStream(body: AsyncIterable<Buffer | string>, opts: CsvStreamOptions): Promise<{ delimiter: Delimiter; records: number }> {
  const it = body[Symbol.asyncIterator]();
  const decoder = new StringDecoder('utf8');
  let bytes = 0;
  let tooLarge = false;
  const take = (chunk: Buffer | string) => {
    const buf = typeof chunk === 'string' ? Buffer.from(chunk) : chunk;
    bytes += buf.length;
    if (bytes > opts.maxBytes) tooLarge = true;
    return decoder.write(buf);
  };

  // Enough text for the header record, to pick the delimiter before parsing starts.
  let head = '';
  let ended = false;
  // Until a whole line break is in: a "\r" at the end of a chunk may be the first half of "\r\n".
  while (!/\n|\r[^\n]/.test(head) && head.length < HEAD_BYTES) {
    const next = await it.next();
    if (next.done) {
      ended = true;
      head += decoder.end();
      break;
    }
    head += take(next.value);
    if (tooLarge) break;
  }
  if (head.charCodeAt(0) === 0xfeff) head = head.slice(1);
  const delimiter = opts.delimiter ?? detectDelimiter(head);
  // Told, not guessed: papaparse would guess from its first chunk, which may end between "\r" and "\n".
  const newline = head.includes('\r\n') ? '\r\n' : head.includes('\n') ? '\n' : head.includes('\r') ? '\r' : undefined;

  let stopped = false;
  async function* text() {
    if (head) yield head;
    if (ended) return;
    while (!tooLarge && !stopped) {
      const next = await it.next();
      if (next.done) {
        const tail = decoder.end();
        if (tail) yield tail;
        return;
      }
      const s = take(next.value);
      if (s && !tooLarge) yield s;
    }
  }

  let records = 0;
  let rowLimitHit = false;
  await new Promise<void>((resolve, reject) => {
    Papa.parse<string[]>(Readable.from(text(), { objectMode: true }) as unknown as File, {
      delimiter,
      ...(newline ? { newline } : {}),
      skipEmptyLines: false,
      // Whole chunks rather than one callback per row: papaparse is about twice as fast that way.
      chunk(results, parser) {
        const problemsAt = new Map<number, string[]>();
        for (const e of results.errors) {
          if (e.row === undefined) continue;
          const reason = e.type === 'Quotes' ? 'a quoted field is not closed (a missing ")' : e.message;
          problemsAt.set(e.row, [...(problemsAt.get(e.row) ?? []), reason]);
        }
        const rows = results.data;
        for (let i = 0; i < rows.length; i++) {
          records++;
          if (records - 1 > opts.maxRows) {
            rowLimitHit = true;
            stopped = true;
            parser.abort();
            return;
          }
          if (opts.onRecord(rows[i], records, problemsAt.get(i) ?? NO_PROBLEMS) === false) {
            stopped = true;
            parser.abort();
            return;
          }
        }
      },
      complete: () => resolve(),
      error: (err: Error) => reject(err),
    });
  });

  // Read what is left of the body, so an early answer reaches the client; give up on a body far past the limit.
  if (!ended) {
    while (bytes <= opts.maxBytes * 2) {
      const next = await it.next();
      if (next.done) break;
      bytes += typeof next.value === 'string' ? Buffer.byteLength(next.value) : next.value.length;
    }
  }
  if (tooLarge || bytes > opts.maxBytes) {
    throw new CsvLimitError('bytes', `The file is larger than the import limit of ${formatBytes(opts.maxBytes)}: split it into smaller files`);
  }
  if (rowLimitHit) {
    throw new CsvLimitError('rows', `The file has more than ${opts.maxRows.toLocaleString('en-US')} data rows, the import limit: split it into smaller files`);
  }
  return { delimiter, records };
}

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${Math.round((n / (1024 * 1024)) * 10) / 10} MB`;
  if (n >= 1024) return `${Math.round(n / 1024)} KB`;
  return `${n} bytes`;
}
