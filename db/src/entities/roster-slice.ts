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
});
