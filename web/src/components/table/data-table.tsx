import { ScrollRegion } from './scroll-region';
import { flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type ColumnDef, type SortingState } from '@tanstack/react-table';
import { useState } from 'react';
import { toCsv, type CsvCell } from '@ratewarden/shared/csv';
import { downloadCsv } from '../../lib/csv';

/**
 * A sortable table (@tanstack/react-table) with a CSV export of exactly the rows and columns shown.
 * Each column says how it exports (`meta.csv`), so suppressed counts leave as "<5", not as numbers.
 */
declare module '@tanstack/react-table' {
  interface ColumnMeta<TData, TValue> {
    csv?: (row: TData) => CsvCell;
    numeric?: boolean;
    /** Phantom use of TValue keeps the augmentation's signature identical to the library's. */
    _value?: TValue;
  }
}

/** `onExport` replaces the export of the rows shown, for data whose export the server must record (the case register). */
export function DataTable<T>({
  caption,
  columns,
  data,
  exportName,
  rowHeader,
  onExport,
}: {
  caption: string;
  columns: ColumnDef<T, any>[];
  data: T[];
  exportName: string;
  rowHeader?: string;
  onExport?: () => void;
}) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const table = useReactTable({
    data,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  function exportRows() {
    const cols = table.getVisibleLeafColumns();
    const header = cols.map((c) => (typeof c.columnDef.header === 'string' ? c.columnDef.header : c.id));
    const rows = table
      .getRowModel()
      .rows.map((r) => cols.map((c) => (c.columnDef.meta?.csv ? c.columnDef.meta.csv(r.original) : (r.getValue(c.id) as CsvCell))));
    downloadCsv(`${exportName}.csv`, toCsv(header, rows));
  }

  return (
    <ScrollRegion label={caption}>
      <table className="w-full border-collapse bg-surface text-sm">
        <caption className="pb-2 text-left">
          <span className="flex flex-wrap items-baseline justify-between gap-2">
            <span className="text-base font-semibold">{caption}</span>
            <button type="button" onClick={onExport ?? exportRows} className="btn btn-quiet no-print btn-small">
              Export CSV<span className="sr-only">: {caption}</span>
            </button>
          </span>
        </caption>
        <thead>
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id} className="border-b-2 border-ink text-left">
              {hg.headers.map((h) => {
                const sorted = h.column.getIsSorted();
                return (
                  <th
                    key={h.id}
                    scope="col"
                    aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}
                    className="px-2 py-1.5 font-semibold"
                  >
                    {h.column.getCanSort() ? (
                      <>
                        <button
                          type="button"
                          onClick={h.column.getToggleSortingHandler()}
                          className="flex items-center gap-1 text-left hover:text-accent-strong"
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden="true" className="text-xs text-ink-soft">
                            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                          </span>
                          <span className="sr-only">{sorted ? `, sorted ${sorted === 'asc' ? 'ascending' : 'descending'}` : ', sort'}</span>
                        </button>
                        {/* Print hides every button: the header's words print from here instead. */}
                        <span className="hidden print:inline">{flexRender(h.column.columnDef.header, h.getContext())}</span>
                      </>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((r) => (
            <tr key={r.id} className="border-b border-line align-top">
              {r.getVisibleCells().map((c) =>
                c.column.id === rowHeader ? (
                  <th key={c.id} scope="row" className="px-2 py-1.5 text-left font-medium">
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </th>
                ) : (
                  <td key={c.id} className={`px-2 py-1.5 ${c.column.columnDef.meta?.numeric ? 'tabular-nums' : ''}`}>
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ),
              )}
            </tr>
          ))}
          {data.length === 0 && (
            <tr>
              <td colSpan={columns.length} className="px-2 py-4 text-ink-soft">
                Nothing to show yet.
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </ScrollRegion>
  );
}
