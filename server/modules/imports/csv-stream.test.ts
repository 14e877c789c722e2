import { describe, expect, it } from 'vitest';
import { CsvLimitError, readCsvStream } from './csv-stream';

async function* inChunks(buf: Buffer, size: number) {
  for (let i = 0; i < buf.length; i += size) yield buf.subarray(i, i + size);
}

async function read(text: string | Buffer, size: number, limits: { maxBytes?: number; maxRows?: number } = {}) {
  const records: { row: number; cells: string[] }[] = [];
  const result = await readCsvStream(inChunks(Buffer.isBuffer(text) ? text : Buffer.from(text), size), {
    maxBytes: limits.maxBytes ?? 1e9,
    maxRows: limits.maxRows ?? 1e9,
    onRecord: (cells, row) => void records.push({ row, cells }),
  });
  return { ...result, records };
}

describe('reading an uploaded CSV as it arrives', () => {
  // "Zoë" has a two-byte UTF-8 "ë"; the BOM is three bytes (EF BB BF, RFC 3629 §6).
  const file = Buffer.from('\uFEFFAddress;Owner;Note\r\n1 A St;Zoë;"line one\r\nline two; still the note"\r\n2 B St;Åsa;\r\n', 'utf8');

  it.each([1, 2, 3, 5, 7, 64, 65536])('gives the same records whatever the chunk size (%i bytes)', async (size) => {
    const { delimiter, records } = await read(file, size);
    expect(delimiter).toBe(';');
    expect(records.slice(0, 3)).toEqual([
      { row: 1, cells: ['Address', 'Owner', 'Note'] },
      { row: 2, cells: ['1 A St', 'Zoë', 'line one\r\nline two; still the note'] },
      { row: 3, cells: ['2 B St', 'Åsa', ''] },
    ]);
  });

  it('stops at the size limit with a clear error', async () => {
    await expect(read('a,b\n' + '1,2\n'.repeat(1000), 100, { maxBytes: 500 })).rejects.toThrow(new CsvLimitError('bytes', 'The file is larger than the import limit of 500 bytes: split it into smaller files'));
  });

  it('stops at the row limit with a clear error', async () => {
    await expect(read('a,b\n' + '1,2\n'.repeat(11), 16, { maxRows: 10 })).rejects.toThrow('The file has more than 10 data rows, the import limit: split it into smaller files');
    expect((await read('a,b\n' + '1,2\n'.repeat(10), 16, { maxRows: 10 })).records).toHaveLength(11);
  });
});
