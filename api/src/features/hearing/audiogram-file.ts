import type { Readable } from 'node:stream';
import { parse } from 'csv-parse/sync';
import ExcelJS from 'exceljs';
import { AppError } from '../../lib/app-error';

/** Audiogram files are small (one row per test × ear): read whole, 20 MiB at most. */
export const AUDIOGRAM_MAX_BYTES = 20 * 1024 * 1024;

export interface SheetLines {
  /** Each line's cells as text, with the line number a person sees (header = 1). */
  lines: { line: number; cells: string[] }[];
  bytes: Buffer;
}

export async function readAll(stream: Readable, maxBytes = AUDIOGRAM_MAX_BYTES): Promise<Buffer> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of stream) {
    size += (chunk as Buffer).length;
    if (size > maxBytes) throw new AppError('payload_too_large', `an audiogram file may be at most ${maxBytes} bytes`);
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks);
}

const isZip = (b: Buffer) => b.length >= 4 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04;

/** A CSV (comma or semicolon) or the first worksheet of an .xlsx, as lines of text cells. */
export async function readSheet(bytes: Buffer): Promise<SheetLines> {
  if (isZip(bytes)) return { lines: await xlsxLines(bytes), bytes };
  const text = bytes.toString('utf8').replace(/^\uFEFF/, '');
  const firstLine = text.slice(0, text.search(/\r?\n|$/));
  const delimiter = firstLine.includes(';') && !firstLine.includes(',') ? ';' : ',';
  let records: string[][];
  try {
    records = parse(text, { delimiter, relax_column_count: true, skip_empty_lines: false, bom: true });
  } catch (err) {
    throw new AppError('validation_failed', `the file is not readable CSV: ${(err as Error).message}`);
  }
  const lines = records.map((cells, i) => ({ line: i + 1, cells })).filter((l) => l.line === 1 || l.cells.some((c) => c.trim() !== ''));
  return { lines, bytes };
}

function cellText(v: ExcelJS.CellValue): string {
  if (v == null) return '';
  // Spreadsheet dates are read as the calendar day written (UTC), never shifted by a time zone.
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  if (typeof v === 'object') {
    if ('result' in v) return cellText(v.result as ExcelJS.CellValue);
    if ('text' in v) return String(v.text);
    if ('richText' in v) return v.richText.map((r) => r.text).join('');
    return '';
  }
  return String(v);
}

async function xlsxLines(bytes: Buffer): Promise<SheetLines['lines']> {
  const book = new ExcelJS.Workbook();
  try {
    await book.xlsx.load(bytes as unknown as ArrayBuffer);
  } catch {
    throw new AppError('validation_failed', 'the file looks like a spreadsheet but could not be read as .xlsx');
  }
  const sheet = book.worksheets[0];
  if (!sheet) throw new AppError('validation_failed', 'the spreadsheet has no worksheet');
  const lines: SheetLines['lines'] = [];
  sheet.eachRow({ includeEmpty: false }, (row, rowNumber) => {
    const cells: string[] = [];
    for (let c = 1; c <= row.cellCount; c += 1) cells.push(cellText(row.getCell(c).value));
    lines.push({ line: rowNumber, cells });
  });
  return lines;
}
