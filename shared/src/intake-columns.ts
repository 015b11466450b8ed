import type { IntakeKind } from './intake';
import { toCsv } from './csv';

/**
 * The roster and case CSV formats: ONE definition of each column's rule. The zod row schemas
 * (intake-schemas.ts) and the API's SQL checks (api/src/features/intake/sql-checks.ts) are both
 * derived from these objects, so a rule cannot say one thing in the browser and another in the
 * database. Patterns are written in the regular-expression subset that JavaScript and
 * PostgreSQL's `~` operator read alike (no look-arounds, no \d shorthand).
 */
export type ColumnRule =
  | { type: 'key'; maxLength: number }
  | { type: 'code'; ref: 'site' | 'exposure_group' | 'outcome' }
  | { type: 'month'; min: string; max: string }
  | { type: 'date'; min: string; max: string }
  | { type: 'decimal'; min: number; max: number; decimals: number }
  | { type: 'integer'; min: number; max: number }
  | { type: 'choice'; values: readonly string[] }
  | { type: 'text'; maxLength: number };

export interface ColumnDef {
  /** Header name, lower case; headers are matched case-insensitively after trimming. */
  name: string;
  /** A required column must be in the header and every row must give it a value. */
  required: boolean;
  rule: ColumnRule;
  description: string;
  example: string;
}

export const rosterColumns = [
  {
    name: 'worker_key',
    required: true,
    rule: { type: 'key', maxLength: 64 },
    description: 'Pseudonymous worker key from HR, the same every month (letters, digits and . _ : / -; no names).',
    example: 'W000123',
  },
  { name: 'site', required: true, rule: { type: 'code', ref: 'site' }, description: 'Site code as set up in Ratewarden.', example: 'NFD' },
  {
    name: 'exposure_group',
    required: true,
    rule: { type: 'code', ref: 'exposure_group' },
    description: 'Exposure group code as set up on the groups page.',
    example: 'FETTLING',
  },
  {
    name: 'month',
    required: true,
    rule: { type: 'month', min: '1950-01', max: '2099-12' },
    description: 'Calendar month worked, ISO 8601 year and month, from 1950-01 to the current month.',
    example: '2024-03',
  },
  {
    name: 'hours',
    required: true,
    rule: { type: 'decimal', min: 0, max: 744, decimals: 2 },
    description: 'Hours worked in that month in that group, decimal point or comma, at most 2 decimals, 0 to 744.',
    example: '151.5',
  },
  { name: 'birth_year', required: true, rule: { type: 'integer', min: 1900, max: 2100 }, description: 'Year of birth (for age bands).', example: '1979' },
  { name: 'sex', required: true, rule: { type: 'choice', values: ['F', 'M', 'X'] }, description: 'F, M or X (for strata).', example: 'F' },
  {
    name: 'job_title',
    required: false,
    rule: { type: 'text', maxLength: 200 },
    description: 'Optional job title, stored as plain text.',
    example: 'Grinder operator',
  },
] as const satisfies readonly ColumnDef[];

export const caseColumns = [
  {
    name: 'case_ref',
    required: true,
    rule: { type: 'key', maxLength: 64 },
    description: 'The case identifier in the occupational health record, stable across corrections.',
    example: 'C-2024-0042',
  },
  { name: 'worker_key', required: true, rule: { type: 'key', maxLength: 64 }, description: 'Worker key as used in the rosters.', example: 'W000123' },
  { name: 'outcome', required: true, rule: { type: 'code', ref: 'outcome' }, description: 'Outcome code as set up on the outcomes page.', example: 'STS' },
  {
    name: 'onset_date',
    required: true,
    rule: { type: 'date', min: '1900-01-01', max: '2099-12-31' },
    description: 'Date of onset (or diagnosis), ISO 8601, from 1900-01-01 to the end of the current month.',
    example: '2024-03-18',
  },
  {
    name: 'status',
    required: true,
    rule: { type: 'choice', values: ['suspected', 'confirmed', 'ruled_out'] },
    description: 'suspected, confirmed or ruled_out.',
    example: 'confirmed',
  },
] as const satisfies readonly ColumnDef[];

export const intakeColumns: Record<IntakeKind, readonly ColumnDef[]> = { roster: rosterColumns, cases: caseColumns };

export type RosterColumn = (typeof rosterColumns)[number]['name'];
export type CaseColumn = (typeof caseColumns)[number]['name'];

/** The shape a value must have, before any range or lookup check. */
export function columnPattern(rule: ColumnRule): string | null {
  switch (rule.type) {
    case 'key':
      // Unbounded here, the length is checked on its own: a {0,63} bound is slow in PostgreSQL's regex engine.
      return '^[A-Za-z0-9][A-Za-z0-9._:/-]*$';
    case 'code':
      return '^[A-Za-z0-9_-]{1,32}$';
    case 'month':
      return '^[0-9]{4}-(0[1-9]|1[0-2])$';
    case 'date':
      return '^[0-9]{4}-(0[1-9]|1[0-2])-(0[1-9]|[12][0-9]|3[01])$';
    case 'decimal':
      return `^[+-]?[0-9]{1,9}([.,][0-9]{1,${rule.decimals}})?$`;
    case 'integer':
      return '^[+-]?[0-9]{1,9}$';
    case 'choice':
    case 'text':
      return null;
  }
}

/** How a value is tidied before checking: trimmed; choices compared in their listed case. */
export function normalizeCell(rule: ColumnRule, raw: string): string {
  const v = raw.trim();
  if (rule.type === 'choice') return rule.values.every((x) => x === x.toUpperCase()) ? v.toUpperCase() : v.toLowerCase();
  if (rule.type === 'code') return v.toUpperCase();
  return v;
}

/** The reasons a hygienist reads, worded once for both the SQL checks and the zod schemas. */
export const reasons = {
  empty: (col: string) => `${col} is empty`,
  shape: (col: string, rule: ColumnRule): string => {
    switch (rule.type) {
      case 'key':
        return `${col} must be 1 to ${rule.maxLength} letters, digits or . _ : / - (starting with a letter or digit)`;
      case 'code':
        return `${col} is not a code (letters, digits, _ or -)`;
      case 'month':
        return `${col} is not a month written YYYY-MM`;
      case 'date':
        return `${col} is not a date written YYYY-MM-DD`;
      case 'decimal':
        return `${col} is not a number (use digits with at most ${rule.decimals} decimals)`;
      case 'integer':
        return `${col} is not a whole number`;
      case 'choice':
        return `${col} must be one of ${rule.values.join(', ')}`;
      case 'text':
        return `${col} is longer than ${rule.maxLength} characters`;
    }
  },
  range: (col: string, min: number | string, max: number | string) => `${col} must be between ${min} and ${max}`,
  future: (col: string, latest: string) => `${col} is after the current month (${latest}); months still to come are not taken in`,
  intakeExpired: (hours: number) =>
    `the intake expired: it was not applied within ${hours} hours of its check and its staged rows were dropped; upload the file again`,
  noSuchDay: (col: string) => `${col} is not a day of the calendar`,
  unknownCode: (col: string, ref: 'site' | 'exposure_group' | 'outcome') =>
    ref === 'site'
      ? `unknown site code; sites are set up by the administrator`
      : ref === 'exposure_group'
        ? `unknown exposure group code; create the group on the groups page first`
        : `unknown outcome code; create the outcome on the outcomes page first`,
  workerTwiceInMonth: 'the worker appears more than once in this month',
  workerTwiceStored: 'the worker is already on the stored roster of another site for this month',
  workerAttributesDiffer: 'birth year or sex differs from another row or an earlier intake for this worker',
  caseWorkerNotRostered: 'the worker is not on any stored roster',
  caseOutsideRoster: 'the onset date falls in a month in which the worker is not on any stored roster',
  caseRefTwice: 'the case reference appears more than once in this file',
  caseDuplicateEvent: 'the same worker, outcome and onset date is already another case (duplicate case event)',
} as const;

/** The downloadable template: the header row and one example row. */
export function templateCsv(kind: IntakeKind): string {
  const cols = intakeColumns[kind];
  return toCsv(
    cols.map((c) => c.name),
    [cols.map((c) => c.example)],
  );
}
