/**
 * CSV export (RFC 4180: comma-separated, CRLF line ends, fields quoted when they hold a comma,
 * quote or line break, quotes doubled). Cells that a spreadsheet would run as a formula, those
 * starting with = + - @ tab or carriage return, get a leading single quote (OWASP "CSV
 * injection" guidance). A negative number would start with "-" too, so real numbers are written
 * as numbers and only text is neutralised.
 */
export type CsvCell = string | number | null | undefined;

const formulaStart = /^[=+\-@\t\r]/;

export function neutraliseCell(cell: CsvCell): string {
  if (cell === null || cell === undefined) return '';
  if (typeof cell === 'number') {
    if (Number.isNaN(cell)) return '';
    if (cell === Infinity) return 'Infinity';
    if (cell === -Infinity) return "'-Infinity";
    return String(cell);
  }
  return formulaStart.test(cell) ? `'${cell}` : cell;
}

function quote(field: string): string {
  return /[",\r\n]/.test(field) ? `"${field.replace(/"/g, '""')}"` : field;
}

export function toCsv(header: string[], rows: CsvCell[][]): string {
  return [header, ...rows].map((row) => row.map((c) => quote(neutraliseCell(c))).join(',')).join('\r\n') + '\r\n';
}

/** Offer a CSV file for download from the browser. The BOM makes spreadsheets read UTF-8. */
export function downloadCsv(filename: string, csv: string): void {
  const url = URL.createObjectURL(new Blob(['\ufeff', csv], { type: 'text/csv;charset=utf-8' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
