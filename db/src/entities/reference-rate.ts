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
});
