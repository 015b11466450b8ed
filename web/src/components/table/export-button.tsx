import { toCsv, type CsvCell } from '@ratewarden/shared/csv';
import { downloadCsv } from '../../lib/csv';

/** The CSV of the table behind a chart, with the chart's title for assistive technology. */
export interface CsvExport {
  name: string;
  header: string[];
  rows: CsvCell[][];
}

export function ExportButton({ csv, label }: { csv: CsvExport; label: string }) {
  return (
    <button type="button" onClick={() => downloadCsv(`${csv.name}.csv`, toCsv(csv.header, csv.rows))} className="btn btn-quiet no-print btn-small">
      Export CSV<span className="sr-only">: {label}</span>
    </button>
  );
}
