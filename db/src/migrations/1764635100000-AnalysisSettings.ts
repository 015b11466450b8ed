import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Analysis settings in the database (issue 15): person-time basis, rate multiplier, confidence
 * level, counted case statuses and age band edges, as numbered versions. A version is never
 * changed: a change is a new row, with who made it and when (and an audit line). Each run records
 * the version it used. The worker's environment (RUN_PER and the others) only seeds version 1 of a
 * new database (worker/src/runs/analysis-settings.ts).
 *
 * Sites can be retired: a retired site keeps its rosters, cases and results, and is no longer
 * expected to report months after the one it was retired in (shared/src/periods.ts).
 */
export class AnalysisSettings1764635100000 implements MigrationInterface {
  name = 'AnalysisSettings1764635100000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE analysis_settings (
        version integer PRIMARY KEY CHECK (version > 0),
        settings jsonb NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        -- null: seeded from the worker's environment for a new database
        created_by uuid REFERENCES users(id),
        created_by_label text NOT NULL
      )`);
    await q.query(`ALTER TABLE runs ADD COLUMN settings_version integer REFERENCES analysis_settings(version)`);
    await q.query(`ALTER TABLE sites ADD COLUMN retired_at timestamptz`);
    // The months after a site's retirement, as a run saw them (false for runs before: nothing was retired).
    await q.query(`ALTER TABLE run_periods ADD COLUMN retired boolean NOT NULL DEFAULT false`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE run_periods DROP COLUMN retired`);
    await q.query(`ALTER TABLE sites DROP COLUMN retired_at`);
    await q.query(`ALTER TABLE runs DROP COLUMN settings_version`);
    await q.query(`DROP TABLE analysis_settings`);
  }
}
