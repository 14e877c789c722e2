import { useMemo } from 'react';
import { readImportRow, type ResolvedColumns } from '@shared/domain/imports';

const PREVIEW = 10;

/** The first rows run through the same checks the server applies, shown as they will be saved. */
export function PreviewTable({ rows, columns }: { rows: { row: number; cells: string[] }[]; columns: ResolvedColumns }) {
  const read = useMemo(() => {
    const currentYear = new Date().getFullYear();
    return rows.slice(0, PREVIEW).map((r) => ({ row: r.row, result: readImportRow(r.cells, columns, r.row, { currentYear }) }));
  }, [rows, columns]);

  return (
    <div className="overflow-x-auto">
      <table className="w-full rounded-md border border-rule bg-panel text-left text-sm" data-testid="import-preview">
        <caption className="p-2 text-left text-muted">The first {Math.min(PREVIEW, rows.length)} rows as they will be saved</caption>
        <thead>
          <tr className="border-b border-rule">
            <th className="p-2">Row</th>
            <th className="p-2">Address</th>
            <th className="p-2">City, state, ZIP</th>
            <th className="p-2">Location</th>
            <th className="p-2">Year built</th>
            <th className="p-2">Builder</th>
            <th className="p-2">Community</th>
            <th className="p-2">Foundation</th>
            <th className="p-2">Owner</th>
            <th className="p-2">Problems</th>
          </tr>
        </thead>
        <tbody className="tabular">
          {read.map(({ row, result }) => {
            if (result.blank) {
              return (
                <tr key={row} className="border-b border-rule/60 text-muted">
                  <td className="p-2">{row}</td>
                  <td className="p-2" colSpan={9}>
                    blank line, skipped
                  </td>
                </tr>
              );
            }
            const c = result.candidate;
            return (
              <tr key={row} className={`border-b border-rule/60 align-top ${c ? '' : 'bg-state-bad/5'}`}>
                <td className="p-2">{row}</td>
                <td className="p-2 font-medium">{c ? `${c.number} ${c.street}${c.unit ? ` #${c.unit}` : ''}` : '—'}</td>
                <td className="p-2">{c ? `${c.city}, ${c.state} ${c.zip}` : ''}</td>
                <td className="p-2">{c ? (c.lat !== null && c.lon !== null ? `${c.lat.toFixed(6)}, ${c.lon.toFixed(6)}` : <span className="text-muted">from the geocoder</span>) : ''}</td>
                <td className="p-2">{c?.yearBuilt ?? ''}</td>
                <td className="p-2">{c?.builder ?? <span className="text-muted">{c ? 'from community' : ''}</span>}</td>
                <td className="p-2">{c?.community ?? <span className="text-muted">{c ? 'by location' : ''}</span>}</td>
                <td className="p-2">{c?.foundation ?? ''}</td>
                <td className="p-2">{c?.ownerName ?? ''}</td>
                <td className="p-2 text-state-bad">
                  {result.errors.map((e) => (
                    <div key={`${e.field}-${e.reason}`}>
                      {e.field}: {e.reason}
                    </div>
                  ))}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
