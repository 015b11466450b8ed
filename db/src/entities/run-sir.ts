import { EntitySchema, type EntitySchemaColumnOptions } from 'typeorm';

/**
 * The SIR of one outcome × exposure group × scope (site, or the company when null) in one run,
 * with the disclosure decision for readers other than the physician (see the ReferenceRates migration).
 */
export interface RunSir {
  runId: string;
  outcomeId: number;
  exposureGroupId: number;
  siteId: number | null;
  referenceTableId: number;
  observed: number;
  expected: number;
  hours: string;
  hoursUncovered: string;
  sir: number | null;
  exactLower: number | null;
  exactUpper: number | null;
  byarLower: number | null;
  byarUpper: number | null;
  confidence: number;
  withheld: 'small' | 'complement' | null;
}

const dbl = (name: string): EntitySchemaColumnOptions => ({ name, type: 'double precision', nullable: true });

export const RunSirEntity = new EntitySchema<RunSir>({
  name: 'RunSir',
  tableName: 'run_sir',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    outcomeId: { name: 'outcome_id', type: 'integer', primary: true },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer', primary: true },
    siteId: { name: 'site_id', type: 'integer', nullable: true },
    referenceTableId: { name: 'reference_table_id', type: 'integer' },
    observed: { type: 'integer' },
    expected: { type: 'double precision' },
    hours: { type: 'numeric' },
    hoursUncovered: { name: 'hours_uncovered', type: 'numeric' },
    sir: dbl('sir'),
    exactLower: dbl('exact_lower'),
    exactUpper: dbl('exact_upper'),
    byarLower: dbl('byar_lower'),
    byarUpper: dbl('byar_upper'),
    confidence: { type: 'double precision' },
    withheld: { type: 'text', nullable: true },
  },
});
