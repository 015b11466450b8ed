import { EntitySchema } from 'typeorm';

/** Hours a worker spent in one exposure group at one site in one month, as brought by one intake. */
export interface RosterEntry {
  intakeId: string;
  workerId: string;
  /** First day of the month, ISO date. */
  month: string;
  siteId: number;
  exposureGroupId: number;
  /** Decimal hours, kept as a string to stay exact. */
  hours: string;
  jobTitle: string | null;
}

export const RosterEntryEntity = new EntitySchema<RosterEntry>({
  name: 'RosterEntry',
  tableName: 'roster_entries',
  columns: {
    intakeId: { name: 'intake_id', type: 'uuid', primary: true },
    workerId: { name: 'worker_id', type: 'bigint', primary: true },
    month: { type: 'date', primary: true },
    siteId: { name: 'site_id', type: 'integer' },
    exposureGroupId: { name: 'exposure_group_id', type: 'integer' },
    hours: { type: 'numeric', precision: 7, scale: 2 },
    jobTitle: { name: 'job_title', type: 'text', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'roster_entries_hours_check', expression: '((hours >= (0)::numeric) AND (hours <= (744)::numeric))' },
    { name: 'roster_entries_month_check', expression: '(EXTRACT(day FROM month) = (1)::numeric)' },
  ],
  indices: [
    { name: 'roster_entries_slice', columns: ['intakeId', 'siteId', 'month'] },
    { name: 'roster_entries_worker', columns: ['workerId', 'month'] },
  ],
});
