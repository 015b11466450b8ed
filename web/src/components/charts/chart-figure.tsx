import { type ReactNode, useState } from 'react';
import { ExportButton, type CsvExport } from '../table/export-button';

/**
 * The frame every chart sits in: its title, a "show as a table" switch (charts always have a
 * table alternative), the chart's own controls (a scale), the CSV export of the table behind it, then the chart and, on demand, the table.
 */
export function ChartFigure({
  title,
  csv,
  chart,
  table,
  controls,
}: {
  title: string;
  csv?: CsvExport;
  chart: ReactNode;
  table: ReactNode;
  controls?: ReactNode;
}) {
  const [showTable, setShowTable] = useState(false);
  return (
    <figure className="mt-4 card p-3">
      <figcaption className="flex flex-wrap items-baseline justify-between gap-2">
        <span className="font-semibold">{title}</span>
        <span className="flex flex-wrap items-baseline gap-3">
          {controls && <span className="no-print">{controls}</span>}
          <button type="button" className="no-print text-sm text-accent underline" aria-expanded={showTable} onClick={() => setShowTable((s) => !s)}>
            {showTable ? 'Hide the table' : 'Show as a table'}
          </button>
          {csv && <ExportButton csv={csv} label={title} />}
        </span>
      </figcaption>
      {chart}
      {showTable && (
        <table className="mt-2 w-full text-sm">
          <caption className="sr-only">{title}, as a table</caption>
          {table}
        </table>
      )}
    </figure>
  );
}
