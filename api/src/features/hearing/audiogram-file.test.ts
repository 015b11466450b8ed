import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { readSheet } from './audiogram-file';

describe('audiogram files as lines of text cells', () => {
  it('reads a semicolon CSV with a byte-order mark, skipping blank lines but keeping line numbers', async () => {
    const { lines } = await readSheet(Buffer.from('\uFEFFworker_key;test_date\r\nW-1;2024-03-04\r\n\r\nW-2;2024-03-05\r\n'));
    expect(lines).toEqual([
      { line: 1, cells: ['worker_key', 'test_date'] },
      { line: 2, cells: ['W-1', '2024-03-04'] },
      { line: 4, cells: ['W-2', '2024-03-05'] },
    ]);
  });

  it('reads the first sheet of an .xlsx, a date cell as its calendar day and an empty cell as empty', async () => {
    const book = new ExcelJS.Workbook();
    const sheet = book.addWorksheet('a');
    sheet.addRow(['worker_key', 'test_date', 'hl_6000', 'hl_8000']);
    sheet.addRow(['W-1', new Date(Date.UTC(2024, 2, 4)), null, 20]);
    const { lines } = await readSheet(Buffer.from(await book.xlsx.writeBuffer()));
    expect(lines[1]).toEqual({ line: 2, cells: ['W-1', '2024-03-04', '', '20'] });
  });

  it('refuses a zip that is not a workbook', async () => {
    await expect(readSheet(Buffer.from([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]))).rejects.toMatchObject({ code: 'validation_failed' });
  });
});
