import { useEffect, useMemo, useRef, useState } from 'react';
import { resolveColumns } from '@shared/domain/imports';
import { IMPORT_FIELD_LABELS, type ColumnMapping, type ImportField } from '@shared/schemas/imports';
import { Button } from '@/components/ui/button';
import { ErrorNote } from '@/components/ui/error-note';
import { useMappingSuggestion } from '../api/suggest-mapping';
import { useKnownNames } from '../api/get-known-names';
import { useStartImport } from '../api/start-import';
import { scanCsv, type ScanResult } from '../utils/scan-csv';
import { MappingForm } from './mapping-form';
import { PreviewTable } from './preview-table';
import { ImportStatus } from './import-status';

const nameKey = (s: string) => s.trim().replace(/\s+/g, ' ').toLowerCase();

/** Choose a file → map its columns → check the preview → import, with progress and the result. */
export function ImportWizard() {
  const [file, setFile] = useState<File | null>(null);
  // One id per chosen file: a double click or a retried request reaches the same job on the server.
  const [importId, setImportId] = useState<string | null>(null);
  const [scan, setScan] = useState<ScanResult | null>(null);
  const [scanProgress, setScanProgress] = useState<{ bytes: number; rows: number } | null>(null);
  const [scanError, setScanError] = useState<Error | null>(null);
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [createBuilders, setCreateBuilders] = useState(false);
  const [createCommunities, setCreateCommunities] = useState(false);
  const [submitted, setSubmitted] = useState<string | null>(null);
  const inputRef = useRef<HTMLInputElement>(null);
  const start = useStartImport();
  const suggestion = useMappingSuggestion(scan?.headers ?? null);
  const known = useKnownNames();

  useEffect(() => {
    if (!file) return;
    setScan(null);
    setScanError(null);
    setMapping(null);
    setScanProgress({ bytes: 0, rows: 0 });
    const job = scanCsv(file, setScanProgress);
    job.promise.then(setScan, setScanError);
    return () => job.cancel();
  }, [file]);

  // The remembered (or guessed) mapping fills the form once; the user's changes win after that.
  useEffect(() => {
    if (suggestion.data && mapping === null) setMapping(suggestion.data.mapping);
  }, [suggestion.data, mapping]);

  const resolved = useMemo(() => (scan && mapping ? resolveColumns(scan.headers, mapping) : null), [scan, mapping]);

  const newNames = useMemo(() => {
    const pick = (field: ImportField, knownList: string[] | undefined) => {
      const col = resolved?.columns[field];
      if (!scan || !col || !knownList) return { names: [] as string[], unknownCount: false };
      const values = scan.distinct[col.index];
      if (values === null) return { names: [], unknownCount: true };
      const have = new Set(knownList.map(nameKey));
      return { names: values.filter((v) => !have.has(nameKey(v.value))).map((v) => v.value), unknownCount: false };
    };
    return { builders: pick('builder', known.data?.builders), communities: pick('community', known.data?.communities) };
  }, [resolved, scan, known.data]);

  function choose(f: File | null) {
    setFile(f);
    setImportId(f ? crypto.randomUUID() : null);
    setSubmitted(null);
    setCreateBuilders(false);
    setCreateCommunities(false);
    start.reset();
  }

  function submit() {
    if (!file || !scan || !mapping || !importId) return;
    setSubmitted(importId);
    start.mutate({ id: importId, file, mapping, delimiter: scan.delimiter, createBuilders, createCommunities });
  }

  const problems = resolved?.problems ?? [];
  const busy = start.isPending;
  const delimiterName = scan ? { ',': 'commas', ';': 'semicolons', '\t': 'tabs', '|': 'pipes' }[scan.delimiter] : '';

  return (
    <div className="flex flex-col gap-4">
      <section aria-label="Choose a file" className="flex flex-col gap-2 rounded-md border border-rule bg-panel p-4">
        <label htmlFor="import-file" className="font-medium">
          CSV file of addresses
        </label>
        <input
          id="import-file"
          ref={inputRef}
          type="file"
          accept=".csv,.txt,.tsv,text/csv,text/plain"
          onChange={(e) => choose(e.target.files?.[0] ?? null)}
          className="text-sm"
        />
        <p className="text-xs text-muted">
          From county records, a builder’s lot list or an HOA roster: one home per row, a header row first. Commas, semicolons or tabs; UTF-8 with or without a BOM. Owner names and
          mailing addresses are personal data: only admins, managers, estimators and sales see them.
        </p>
        {scanProgress && !scan && !scanError && file && (
          <p className="text-sm text-muted" aria-live="polite">
            Reading {file.name}… {scanProgress.rows.toLocaleString()} rows ({Math.round((scanProgress.bytes / Math.max(1, file.size)) * 100)} %)
          </p>
        )}
        {scanError && <ErrorNote error={scanError} />}
        {scan && file && (
          <p className="text-sm">
            <span className="font-medium">{file.name}</span>: {scan.rows.toLocaleString()} rows, {scan.headers.length} columns separated by {delimiterName}.
          </p>
        )}
      </section>

      {scan && scan.headers.length > 0 && (
        <section aria-label="Map the columns" className="flex flex-col gap-2">
          <h2 className="font-semibold">Map the columns</h2>
          {suggestion.data && (
            <p className="text-sm text-muted">
              {suggestion.data.source === 'remembered' ? 'Your mapping from the last file with these headers.' : 'Guessed from the header names: check each field.'}
            </p>
          )}
          {suggestion.error && <ErrorNote error={suggestion.error} />}
          {mapping && <MappingForm headers={scan.headers} firstRow={scan.preview[0]?.cells} mapping={mapping} onChange={setMapping} />}
        </section>
      )}

      {scan && mapping && resolved && (
        <section aria-label="Preview" className="flex flex-col gap-3">
          <h2 className="font-semibold">Preview</h2>
          {problems.length > 0 ? (
            <div role="alert" className="rounded-md border border-state-bad/40 bg-state-bad/5 p-3 text-sm">
              <p className="font-medium">Map these before importing:</p>
              <ul className="list-disc pl-5">
                {problems.map((p) => (
                  <li key={p.field + p.message}>{p.message}</li>
                ))}
              </ul>
            </div>
          ) : (
            <PreviewTable rows={scan.preview} columns={resolved.columns} />
          )}

          {(newNames.builders.names.length > 0 || newNames.builders.unknownCount) && (
            <label className="flex items-start gap-2 text-sm">
              <input type="checkbox" className="mt-1 h-5 w-5" checked={createBuilders} onChange={(e) => setCreateBuilders(e.target.checked)} />
              <span>
                Create new builders for names not in your list
                {newNames.builders.names.length > 0 && <>: {newNames.builders.names.slice(0, 8).join(', ')}{newNames.builders.names.length > 8 ? ` and ${newNames.builders.names.length - 8} more` : ''}</>}. Otherwise rows naming them
                are reported, not imported.
              </span>
            </label>
          )}
          {(newNames.communities.names.length > 0 || newNames.communities.unknownCount) && (
            <label className="flex items-start gap-2 text-sm">
              <input type="checkbox" className="mt-1 h-5 w-5" checked={createCommunities} onChange={(e) => setCreateCommunities(e.target.checked)} />
              <span>
                Create new communities (without a boundary yet) for names not in your list
                {newNames.communities.names.length > 0 && <>: {newNames.communities.names.slice(0, 8).join(', ')}{newNames.communities.names.length > 8 ? ` and ${newNames.communities.names.length - 8} more` : ''}</>}.
                Otherwise rows naming them are reported, not imported.
              </span>
            </label>
          )}

          <div className="flex flex-wrap items-center gap-3">
            <Button onClick={submit} disabled={busy || problems.length > 0 || submitted === importId}>
              Import {scan.rows.toLocaleString()} {scan.rows === 1 ? 'row' : 'rows'}
            </Button>
            {submitted && (
              <Button variant="secondary" onClick={() => { choose(null); if (inputRef.current) inputRef.current.value = ''; }}>
                Import another file
              </Button>
            )}
            <span className="text-xs text-muted">
              Rows with problems are listed and can be downloaded to fix; the others are imported. Re-importing a file updates the same homes instead of adding them twice.
            </span>
          </div>
          {start.error && <ErrorNote error={start.error} />}
          {!problems.length && Object.keys(mapping).length > 0 && <MappedSummary mapping={mapping} />}
        </section>
      )}

      {submitted && !start.error && <ImportStatus id={submitted} />}
    </div>
  );
}

function MappedSummary({ mapping }: { mapping: ColumnMapping }) {
  const fields = Object.keys(mapping) as ImportField[];
  return <p className="text-xs text-muted">Reading {fields.map((f) => IMPORT_FIELD_LABELS[f]).join(', ')}.</p>;
}
