import { EntitySchema } from 'typeorm';

/** Which applied intake holds the current roster of one site × month. */
export interface RosterSlice {
  siteId: number;
  month: string;
  intakeId: string;
}

export const RosterSliceEntity = new EntitySchema<RosterSlice>({
  name: 'RosterSlice',
  tableName: 'roster_slices',
  columns: {
    siteId: { name: 'site_id', type: 'integer', primary: true },
    month: { type: 'date', primary: true },
    intakeId: { name: 'intake_id', type: 'uuid' },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [{ name: 'roster_slices_month_check', expression: '(EXTRACT(day FROM month) = (1)::numeric)' }],
  indices: [{ name: 'roster_slices_intake', columns: ['intakeId'] }],
  foreignKeys: [
    { name: 'roster_slices_intake_id_fkey', target: 'Intake', columnNames: ['intake_id'], referencedColumnNames: ['id'] },
    { name: 'roster_slices_site_id_fkey', target: 'Site', columnNames: ['site_id'], referencedColumnNames: ['id'] },
  ],
});
