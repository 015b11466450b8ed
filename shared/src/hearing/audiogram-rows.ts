/**
 * Ratewarden's audiogram file (CSV, or the first sheet of an .xlsx): one row per test × ear.
 * Columns, in any order, names case-insensitive: worker_key, test_date (YYYY-MM-DD), ear (left |
 * right), test_type (baseline | annual | retest), hl_500 … hl_6000 (dB HL, required) and hl_8000
 * (optional, may be blank). Every cell is judged here; what needs the store (known workers, tests
 * already stored) is judged by the API.
 */
import { z } from 'zod';
import { isCalendarDate } from '../intake-cell';
import { THRESHOLD_MAX_DB, THRESHOLD_MIN_DB, THRESHOLD_STEP_DB, type AudiogramTestType, type Ear, type EarThresholds } from './audiogram';

export const REQUIRED_LEVEL_COLUMNS = ['hl_500', 'hl_1000', 'hl_2000', 'hl_3000', 'hl_4000', 'hl_6000'] as const;
export const AUDIOGRAM_COLUMNS = ['worker_key', 'test_date', 'ear', 'test_type', ...REQUIRED_LEVEL_COLUMNS, 'hl_8000'] as const;
export type AudiogramColumn = (typeof AUDIOGRAM_COLUMNS)[number];
export const OPTIONAL_COLUMNS: readonly AudiogramColumn[] = ['hl_8000'];

export const AUDIOGRAM_TEMPLATE_CSV = `${AUDIOGRAM_COLUMNS.join(',')}\nW-0001,2024-03-04,left,baseline,5,5,10,10,15,15,20\nW-0001,2024-03-04,right,baseline,0,5,5,10,10,15,\n`;

export interface AudiogramProblem {
  /** File line (header = 1; spreadsheet row number for .xlsx). */
  line: number;
  column: string | null;
  value: string | null;
  reason: string;
}

export interface AudiogramRow {
  line: number;
  workerKey: string;
  testDate: string;
  ear: Ear;
  testType: AudiogramTestType;
  thresholds: EarThresholds;
}

const reasons = {
  missingColumn: (c: string) => `the header has no column ${c}`,
  unknownColumn: 'not a column of the audiogram format',
  twiceColumn: 'the column appears twice',
  empty: 'empty',
  workerKey: 'a worker key is 1 to 64 letters, digits, dots, dashes or underscores',
  date: 'not a date as YYYY-MM-DD',
  dateRange: 'test date must be from 1950-01-01 to today',
  ear: 'ear is left or right',
  testType: 'test type is baseline, annual or retest',
  level: `hearing level must be a whole number of dB HL from ${THRESHOLD_MIN_DB} to ${THRESHOLD_MAX_DB}`,
  step: `hearing level must be a multiple of ${THRESHOLD_STEP_DB} dB`,
  twice: 'the same worker, test date, ear and test type appear twice in the file',
} as const;
export const audiogramReasons = reasons;

export const earSchema = z.enum(['left', 'right']);
export const testTypeSchema = z.enum(['baseline', 'annual', 'retest']);

/** Maps the header to column positions, or the header's problems. */
export function readAudiogramHeader(header: string[]): { index: Map<AudiogramColumn, number>; problems: AudiogramProblem[] } {
  const index = new Map<AudiogramColumn, number>();
  const problems: AudiogramProblem[] = [];
  header.forEach((raw, i) => {
    const name = raw
      .trim()
      .toLowerCase()
      .replace(/^\uFEFF/, '');
    if (!(AUDIOGRAM_COLUMNS as readonly string[]).includes(name)) {
      if (name !== '') problems.push({ line: 1, column: raw, value: null, reason: reasons.unknownColumn });
      return;
    }
    if (index.has(name as AudiogramColumn)) problems.push({ line: 1, column: name, value: null, reason: reasons.twiceColumn });
    else index.set(name as AudiogramColumn, i);
  });
  for (const c of AUDIOGRAM_COLUMNS) {
    if (!index.has(c) && !OPTIONAL_COLUMNS.includes(c)) problems.push({ line: 1, column: c, value: null, reason: reasons.missingColumn(c) });
  }
  return { index, problems };
}

function level(text: string): number | string {
  if (!/^-?\d+$/.test(text)) return reasons.level;
  const v = Number(text);
  if (v < THRESHOLD_MIN_DB || v > THRESHOLD_MAX_DB) return reasons.level;
  if (v % THRESHOLD_STEP_DB !== 0) return reasons.step;
  return v;
}

/**
 * Judges one data row. `today` bounds the test date (YYYY-MM-DD).
 * @returns the typed row, or its problems (one per wrong cell).
 */
export function readAudiogramRow(
  cells: string[],
  line: number,
  index: Map<AudiogramColumn, number>,
  today: string,
): { row: AudiogramRow | null; problems: AudiogramProblem[] } {
  const problems: AudiogramProblem[] = [];
  const get = (c: AudiogramColumn) => (index.has(c) ? (cells[index.get(c)!] ?? '').trim() : '');
  const bad = (column: AudiogramColumn, value: string, reason: string) => problems.push({ line, column, value, reason });

  const workerKey = get('worker_key');
  if (workerKey === '') bad('worker_key', workerKey, reasons.empty);
  else if (!/^[A-Za-z0-9._-]{1,64}$/.test(workerKey)) bad('worker_key', workerKey, reasons.workerKey);

  const testDate = get('test_date');
  if (
    !/^\d{4}-\d{2}-\d{2}$/.test(testDate) ||
    !isCalendarDate(testDate) ||
    Number(testDate.slice(5, 7)) < 1 ||
    Number(testDate.slice(5, 7)) > 12 ||
    Number(testDate.slice(8)) < 1
  ) {
    bad('test_date', testDate, testDate === '' ? reasons.empty : reasons.date);
  } else if (testDate < '1950-01-01' || testDate > today) bad('test_date', testDate, reasons.dateRange);

  const ear = earSchema.safeParse(get('ear').toLowerCase());
  if (!ear.success) bad('ear', get('ear'), reasons.ear);
  const testType = testTypeSchema.safeParse(get('test_type').toLowerCase());
  if (!testType.success) bad('test_type', get('test_type'), reasons.testType);

  const thresholds = {} as Record<string, number | null>;
  for (const c of [...REQUIRED_LEVEL_COLUMNS, 'hl_8000'] as const) {
    const text = get(c);
    const hz = Number(c.slice(3));
    if (text === '') {
      if (c === 'hl_8000') thresholds[hz] = null;
      else bad(c, text, reasons.empty);
      continue;
    }
    const v = level(text);
    if (typeof v === 'string') bad(c, text, v);
    else thresholds[hz] = v;
  }
  if (problems.length) return { row: null, problems };
  return {
    row: { line, workerKey, testDate, ear: ear.data!, testType: testType.data!, thresholds: thresholds as unknown as EarThresholds },
    problems,
  };
}

/** The same worker × date × ear × type twice in one file. */
export function duplicateRows(rows: AudiogramRow[]): AudiogramProblem[] {
  const seen = new Set<string>();
  const problems: AudiogramProblem[] = [];
  for (const r of rows) {
    const key = `${r.workerKey}|${r.testDate}|${r.ear}|${r.testType}`;
    if (seen.has(key)) problems.push({ line: r.line, column: 'test_date', value: r.testDate, reason: reasons.twice });
    seen.add(key);
  }
  return problems;
}
