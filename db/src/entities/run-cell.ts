import { EntitySchema } from 'typeorm';

/**
 * One cell a run aggregated: cases and hours of one outcome × month × site × exposure group ×
 * age band × sex (see the RunCells migration). Written by the run with COPY, read with SQL. The
 * run's GROUP BY makes the seven key columns unique; two of them (age band, sex) may be null,
 * which a primary key cannot hold, so the entity names the non-null ones as its key.
 */
export interface RunCell {
  runId: string;
  outcomeId: number;
  month: string;
  siteId: number;
  exposureGroupId: number;
  /** Lower bound of the 10-year band (40 = 40–49); null when the birth year is unknown. */
  ageBand: number | null;
  sex: string | null;
  /** numeric(14, 2), as text to keep it exact. */
  hours: string;
  cases: number;
}

export const RunCellEntity = new EntitySchema<RunCell>({
  name: 'RunCell',
  tableName: 'run_cells',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    outcomeId: { name: 'outcome_id', type: 'integer', primary: true },
    month: { type: 'date', primary: true },
    siteId: { name: 'site_id', type: 'integer', primary: true },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer', primary: true },
    ageBand: { name: 'age_band', type: 'smallint', nullable: true },
    sex: { type: 'text', nullable: true },
    hours: { type: 'numeric', precision: 14, scale: 2 },
    cases: { type: 'integer' },
  },
});
