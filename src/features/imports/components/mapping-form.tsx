import { IMPORT_FIELDS, IMPORT_FIELD_LABELS, REQUIRED_IMPORT_FIELDS, type ColumnMapping, type ImportField } from '@shared/schemas/imports';

const HINTS: Partial<Record<ImportField, string>> = {
  address: 'House number and street, e.g. "123 N Oak St Apt 4"',
  houseNumber: 'Only if the number has its own column',
  latitude: 'Rows without coordinates are placed by the geocoder',
  longitude: 'Rows without coordinates are placed by the geocoder',
  builder: 'If empty, the community’s builder when it has one',
  community: 'If empty, the community whose boundary the home lies in',
  doNotContact: 'yes / no',
};

/** One row per field: which column of the file holds it, and the value in the first data row. */
export function MappingForm({
  headers,
  firstRow,
  mapping,
  onChange,
}: {
  headers: string[];
  firstRow: string[] | undefined;
  mapping: ColumnMapping;
  onChange(mapping: ColumnMapping): void;
}) {
  function set(field: ImportField, header: string) {
    const next: ColumnMapping = { ...mapping };
    // A column feeds one field: taking it here frees it elsewhere.
    for (const f of IMPORT_FIELDS) if (header && next[f] === header) delete next[f];
    if (header) next[field] = header;
    else delete next[field];
    onChange(next);
  }
  return (
    <table className="w-full rounded-md border border-rule bg-panel text-left text-sm">
      <caption className="sr-only">Which column holds each field</caption>
      <thead>
        <tr className="border-b border-rule">
          <th className="p-2">Field</th>
          <th className="p-2">Column in your file</th>
          <th className="p-2">First row</th>
        </tr>
      </thead>
      <tbody>
        {IMPORT_FIELDS.map((field) => {
          const id = `map-${field}`;
          const header = mapping[field] ?? '';
          const index = header ? headers.indexOf(header) : -1;
          const required = REQUIRED_IMPORT_FIELDS.includes(field);
          return (
            <tr key={field} className="border-b border-rule/60 align-top">
              <td className="p-2">
                <label htmlFor={id} className="font-medium">
                  {IMPORT_FIELD_LABELS[field]}
                </label>
                {required && <span className="ml-1 text-xs text-muted">(required)</span>}
                {HINTS[field] && <div className="text-xs text-muted">{HINTS[field]}</div>}
              </td>
              <td className="p-2">
                <select
                  id={id}
                  value={header}
                  onChange={(e) => set(field, e.target.value)}
                  className="min-h-11 w-full rounded-md border border-rule bg-panel px-2"
                >
                  <option value="">— not in this file —</option>
                  {headers.map((h, i) => (
                    <option key={`${h}-${i}`} value={h}>
                      {h || `(column ${i + 1} has no name)`}
                    </option>
                  ))}
                </select>
              </td>
              <td className="p-2 text-muted">{index >= 0 ? firstRow?.[index] : ''}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
