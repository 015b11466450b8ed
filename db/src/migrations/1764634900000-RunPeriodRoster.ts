import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Whether each site × month a run saw had its roster (shared/src/periods.ts): a month closed
 * without one (the site did not work it) must not make its site expected in the months after.
 * Null for runs stored before: their state alone decides.
 */
export class RunPeriodRoster1764634900000 implements MigrationInterface {
  name = 'RunPeriodRoster1764634900000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE run_periods ADD COLUMN roster boolean`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE run_periods DROP COLUMN roster`);
  }
}
