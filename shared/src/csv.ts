/**
 * CSV for files people open in a spreadsheet, the one guard for every export and template (RFC 4180: comma-separated, CRLF line ends, fields quoted when they hold a comma,
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
