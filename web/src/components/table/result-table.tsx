import type { ReactNode } from 'react';
import { ScrollRegion } from './scroll-region';
import { toCsv, type CsvCell } from '@ratewarden/shared/csv';
import { downloadCsv } from '../../lib/csv';

/**
 * A small table of results: the first column names the row (a row header), the rest are figures.
 * `csv` gives the raw numbers behind the formatted cells for the export (under `csvColumns` when
 * the export has other columns than the screen).
 */
export interface ResultRow {
  key: string;
  cells: ReactNode[];
  csv: CsvCell[];
}

export function ResultTable({
  caption,
  columns,
  rows,
  exportName,
  csvColumns,
}: {
  caption: string;
  columns: string[];
  rows: ResultRow[];
  exportName?: string;
  csvColumns?: string[];
}) {
  return (
    <ScrollRegion label={caption}>
      <table className="w-full border-collapse bg-surface text-sm">
        <caption className="pb-2 text-left">
          <span className="flex flex-wrap items-baseline justify-between gap-2">
            <span className="text-base font-semibold">{caption}</span>
            {exportName && (
              <button
                type="button"
                className="btn btn-quiet no-print btn-small"
                onClick={() =>
                  downloadCsv(
                    `${exportName}.csv`,
                    toCsv(
                      csvColumns ?? columns,
                      rows.map((r) => r.csv),
                    ),
                  )
                }
              >
                Export CSV<span className="sr-only">: {caption}</span>
              </button>
            )}
          </span>
        </caption>
        <thead>
          <tr className="border-b-2 border-ink text-left">
            {columns.map((c) => (
              <th key={c} scope="col" className="px-2 py-1.5 font-semibold">
                {c}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-b border-line align-top">
              {r.cells.map((c, i) =>
                i === 0 ? (
                  <th key={i} scope="row" className="px-2 py-1.5 text-left font-medium">
                    {c}
                  </th>
                ) : (
                  <td key={i} className="px-2 py-1.5 tabular-nums">
                    {c}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}
