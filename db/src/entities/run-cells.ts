import { EntitySchema } from 'typeorm';

/**
 * The cells a run aggregated for one outcome and exposure group, as parallel arrays: element i is
 * the cell of months[i] × site_ids[i] × age_bands[i] × sexes[i] with hours[i] and cases[i] (see the
 * RunCells migration). Written by the run with COPY, read with SQL through unnest.
 */
export interface RunCells {
  runId: string;
  outcomeId: number;
  exposureGroupId: number;
  months: string[];
  siteIds: number[];
  /** Lower bound of the 10-year band (40 = 40–49); null when the birth year is unknown. */
  ageBands: Array<number | null>;
  sexes: Array<string | null>;
  /** numeric(14, 2), as text to keep it exact. */
  hours: string[];
  cases: number[];
}

export const RunCellsEntity = new EntitySchema<RunCells>({
  name: 'RunCells',
  tableName: 'run_cells',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    outcomeId: { name: 'outcome_id', type: 'integer', primary: true },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer', primary: true },
    months: { type: 'date', array: true },
    siteIds: { name: 'site_ids', type: 'integer', array: true },
    ageBands: { name: 'age_bands', type: 'smallint', array: true },
    sexes: { type: 'text', array: true },
    hours: { type: 'numeric', precision: 14, scale: 2, array: true },
    cases: { type: 'integer', array: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    {
      name: 'run_cells_check',
      expression:
        '((cardinality(months) = cardinality(site_ids)) AND (cardinality(months) = cardinality(age_bands)) AND (cardinality(months) = cardinality(sexes)) AND (cardinality(months) = cardinality(hours)) AND (cardinality(months) = cardinality(cases)))',
    },
  ],
  foreignKeys: [{ name: 'run_cells_run_id_fkey', target: 'Run', columnNames: ['run_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' }],
});
