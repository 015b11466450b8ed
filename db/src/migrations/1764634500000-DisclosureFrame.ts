import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Each run's disclosure frame (worker/src/disclosure/disclosure-frame.ts): one row per count the
 * run withholds from every reader but the physician, by scope (site, or null for the company),
 * outcome, exposure group, window (month, rolling12, series, strata_age, strata_sex) and period
 * (null for a series), with the reason (small, complement, months, strata). Every table, flag
 * and notice reads it, so all of them withhold the same counts. `runs.disclosure_frame` says a
 * run has one: runs stored before it have none, and their figures are the physician's alone
 * until the run this migration requests has replaced them.
 */
export class DisclosureFrame1764634500000 implements MigrationInterface {
  name = 'DisclosureFrame1764634500000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE runs ADD COLUMN disclosure_frame boolean NOT NULL DEFAULT false`);
    await q.query(`
      CREATE TABLE run_withheld (
        run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
        site_id integer,
        outcome_id integer NOT NULL,
        exposure_group_id integer NOT NULL,
        window_kind text NOT NULL CHECK (window_kind IN ('month', 'rolling12', 'series', 'strata_age', 'strata_sex')),
        period date,
        reason text NOT NULL CHECK (reason IN ('small', 'complement', 'months', 'strata'))
      )`);
    await q.query(`CREATE INDEX run_withheld_lookup ON run_withheld (run_id, outcome_id, exposure_group_id)`);
    await q.query(
      `INSERT INTO run_requests (reason) SELECT 'figures protected against derivation: a new run publishes them' WHERE EXISTS (SELECT 1 FROM runs)`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE run_withheld`);
    await q.query(`ALTER TABLE runs DROP COLUMN disclosure_frame`);
  }
}
