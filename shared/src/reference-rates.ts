import { z } from 'zod';
import { toCsv } from './csv';
import type { ColumnDef } from './intake-columns';
import { intakeProblemSchema } from './intake-schemas';

/**
 * External reference rates (for the standardized incidence ratio): Ratewarden's own CSV format,
 * one row per outcome × sex × age band × calendar year. The columns' rules are stated once here
 * and judged by the same cell judge as the roster and case intakes (intake-cell.ts).
 */
export const referenceRateColumns = [
  { name: 'outcome', required: true, rule: { type: 'code', ref: 'outcome' }, description: 'Outcome code as set up on the outcomes page.', example: 'STS' },
  { name: 'sex', required: true, rule: { type: 'choice', values: ['F', 'M'] }, description: 'F or M: reference rates are given per sex.', example: 'F' },
  {
    name: 'age_from',
    required: true,
    rule: { type: 'integer', min: 0, max: 120 },
    description: 'Lowest age of the band in whole years (age = calendar year − birth year), included.',
    example: '25',
  },
  {
    name: 'age_to',
    required: true,
    rule: { type: 'integer', min: 0, max: 120 },
    description: 'Highest age of the band, included (write 120 for an open top band such as 85+).',
    example: '34',
  },
  { name: 'year', required: true, rule: { type: 'integer', min: 1950, max: 2099 }, description: 'Calendar year the rate applies to.', example: '2024' },
  {
    name: 'rate_per_person_year',
    required: true,
    rule: { type: 'decimal', min: 0, max: 1000, decimals: 12 },
    description: 'Cases per person-year (not per 1,000 or 100,000: divide first), decimal point or comma, at most 12 decimals.',
    example: '0.0042',
  },
  {
    name: 'source',
    required: true,
    rule: { type: 'text', maxLength: 500 },
    description: 'Where the rate comes from, free text (publisher, table, edition).',
    example: 'National registry, table 4, 2024 edition',
  },
] as const satisfies readonly ColumnDef[];

export type ReferenceRateColumn = (typeof referenceRateColumns)[number]['name'];

/** Person-years per hour worked: reference rates are per person-year, 2,000 h each (common practice). */
export const HOURS_PER_PERSON_YEAR = 2000;

/** Largest reference-rate file accepted (bytes): a national table by sex × band × year is a few thousand rows. */
export const REFERENCE_RATES_MAX_BYTES = 5 * 1024 * 1024;

/** The reasons a hygienist reads for rows that break the table's own rules (beyond each cell's rule). */
export const referenceReasons = {
  bandReversed: 'age_to is below age_from',
  bandOverlap: 'this age band overlaps another band of the same outcome, sex and year in the file',
  noRows: 'the file holds no reference rates',
} as const;

export function referenceTemplateCsv(): string {
  const cols = referenceRateColumns;
  return toCsv(
    cols.map((c) => c.name),
    [cols.map((c) => c.example)],
  );
}

// ---- API shapes -------------------------------------------------------------------------------

export const referenceTableStateSchema = z.enum(['applied', 'superseded', 'rejected']);

/** One uploaded version of the reference-rate table. */
export const referenceTableSchema = z.object({
  id: z.number().int(),
  version: z.number().int(),
  state: referenceTableStateSchema,
  fileName: z.string(),
  rowCount: z.number().int(),
  problemCount: z.number().int(),
  problems: z.array(intakeProblemSchema),
  /** The distinct sources the rows name. */
  sources: z.array(z.string()),
  outcomeCodes: z.array(z.string()),
  yearFrom: z.number().int().nullable(),
  yearTo: z.number().int().nullable(),
  uploadedBy: z.string().nullable(),
  createdAt: z.string(),
  supersededAt: z.string().nullable(),
});
export type ReferenceTable = z.infer<typeof referenceTableSchema>;

export const referenceRateRowSchema = z.object({
  outcomeCode: z.string(),
  sex: z.enum(['F', 'M']),
  ageFrom: z.number().int(),
  ageTo: z.number().int(),
  year: z.number().int(),
  rate: z.number(),
  source: z.string(),
});
export type ReferenceRateRow = z.infer<typeof referenceRateRowSchema>;

export const referenceRatesQuerySchema = z.object({ version: z.coerce.number().int().positive().optional() }).strict();

const limit = z.union([z.number(), z.literal('Infinity')]).nullable();

/**
 * The SIR of one exposure group (company-wide or one site) for one outcome, from one run. A
 * withheld observed count (small, or the complement of a small one) takes with it every figure
 * it could be read back from: the SIR (O = SIR × E), O − E and the limits (each a function of O).
 */
export const sirRowSchema = z.object({
  outcomeId: z.number().int(),
  exposureGroupId: z.number().int(),
  siteId: z.number().int().nullable(),
  observed: z.number().int().nullable(),
  expected: z.number(),
  sir: z.number().nullable(),
  excess: z.number().nullable(),
  exact: z.object({ lower: limit, upper: limit }),
  byar: z.object({ lower: limit, upper: limit }),
  /** Person-years of the group that a reference rate covered, and those it did not (unknown age or sex X, years or bands missing). */
  personYears: z.number(),
  personYearsUncovered: z.number(),
  confidence: z.number(),
  withheld: z.enum(['small', 'complement']).nullable(),
  methods: z.object({ exact: z.string(), byar: z.string() }),
});
export type SirRow = z.infer<typeof sirRowSchema>;

export const sirQuerySchema = z
  .object({ outcomeId: z.coerce.number().int().positive().optional(), siteId: z.coerce.number().int().positive().optional() })
  .strict();

export const sirAnswerSchema = z.object({
  runId: z.string(),
  runNumber: z.number().int(),
  /** The reference-rate table version the run used, null when none was loaded. */
  referenceVersion: z.number().int().nullable(),
  sources: z.array(z.string()),
  rows: z.array(sirRowSchema),
});
export type SirAnswer = z.infer<typeof sirAnswerSchema>;
