import { EntitySchema } from 'typeorm';
import type { CountingRule } from '@ratewarden/shared/domain';
import { timestampColumns, type Timestamps } from './base';

/** A health outcome under surveillance, with its case definition and counting rule. */
export interface Outcome extends Timestamps {
  id: number;
  code: string;
  name: string;
  caseDefinition: string;
  countingRule: CountingRule;
  /** Months between exposure and the person-time it is credited to. */
  lagMonths: number;
  /** Overrides the global reference group for this outcome. */
  referenceGroupId: number | null;
}

export const OutcomeEntity = new EntitySchema<Outcome>({
  name: 'Outcome',
  tableName: 'outcomes',
  columns: {
    id: { type: 'integer', primary: true, generated: 'increment' },
    code: { type: 'text', unique: true },
    name: { type: 'text' },
    caseDefinition: { name: 'case_definition', type: 'text' },
    countingRule: { name: 'counting_rule', type: 'text' },
    lagMonths: { name: 'lag_months', type: 'integer', default: 0 },
    referenceGroupId: { name: 'reference_group_id', type: 'integer', nullable: true },
    ...timestampColumns,
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'outcomes_code_check', expression: "(code ~ '^[A-Za-z0-9_-]{1,32}$'::text)" },
    { name: 'outcomes_counting_rule_check', expression: "(counting_rule = ANY (ARRAY['recurrent'::text, 'first_event'::text]))" },
    { name: 'outcomes_lag_months_check', expression: '((lag_months >= 0) AND (lag_months <= 240))' },
  ],
  foreignKeys: [{ name: 'outcomes_reference_group_id_fkey', target: 'ExposureGroup', columnNames: ['reference_group_id'], referencedColumnNames: ['id'] }],
});
