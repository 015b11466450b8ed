import { EntitySchema } from 'typeorm';

/** One reference rate (cases per person-year) of an outcome × sex × age band × year, in one table version. */
export interface ReferenceRate {
  tableId: number;
  outcomeId: number;
  sex: 'F' | 'M';
  ageFrom: number;
  ageTo: number;
  year: number;
  rate: number;
  source: string;
}

export const ReferenceRateEntity = new EntitySchema<ReferenceRate>({
  name: 'ReferenceRate',
  tableName: 'reference_rates',
  columns: {
    tableId: { name: 'table_id', type: 'integer', primary: true },
    outcomeId: { name: 'outcome_id', type: 'integer', primary: true },
    sex: { type: 'text', primary: true },
    ageFrom: { name: 'age_from', type: 'integer', primary: true },
    ageTo: { name: 'age_to', type: 'integer' },
    year: { type: 'integer', primary: true },
    rate: { type: 'double precision' },
    source: { type: 'text' },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'reference_rates_age_from_check', expression: '((age_from >= 0) AND (age_from <= 120))' },
    { name: 'reference_rates_check', expression: '(((age_to >= 0) AND (age_to <= 120)) AND (age_to >= age_from))' },
    { name: 'reference_rates_rate_check', expression: '(rate >= (0)::double precision)' },
    { name: 'reference_rates_sex_check', expression: "(sex = ANY (ARRAY['F'::text, 'M'::text]))" },
    { name: 'reference_rates_year_check', expression: '((year >= 1950) AND (year <= 2099))' },
  ],
  foreignKeys: [
    { name: 'reference_rates_outcome_id_fkey', target: 'Outcome', columnNames: ['outcome_id'], referencedColumnNames: ['id'] },
    { name: 'reference_rates_table_id_fkey', target: 'ReferenceRateTable', columnNames: ['table_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
  ],
});
