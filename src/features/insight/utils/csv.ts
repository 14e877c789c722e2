import Papa from 'papaparse';

/**
 * CSV text safe to open in a spreadsheet: cells that begin with = + - @ tab or carriage return are
 * prefixed with a single quote so they are read as text, not formulas (OWASP, "CSV Injection").
 * Numbers stay numbers. papaparse's `escapeFormulae` does exactly this.
 */
export function toSafeCsv(header: string[], rows: (string | number | null)[][]): string {
  return Papa.unparse({ fields: header, data: rows.map((r) => r.map((v) => (v === null ? '' : v))) }, { escapeFormulae: true, newline: '\r\n' });
}

/** Saves text as a file through a temporary object URL. */
export function downloadText(fileName: string, text: string, type = 'text/csv;charset=utf-8') {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  URL.revokeObjectURL(url);
}
