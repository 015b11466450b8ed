import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Staging for intakes and the queue of run requests.
 *
 * Each upload is COPYed into tables of its own in the `intake_staging` schema (named after
 * `intakes.staging_table`): a case list as raw text, a roster as typed rows split and judged cell
 * by cell while it streams in (api/src/features/intake/roster-stream.ts), with small per-worker and
 * per-site × month tallies beside it. The checks that need stored data run there set-wise in SQL,
 * and apply reads from there. The tables are created at intake time, so this migration only makes
 * the schema. Staging tables are UNLOGGED: they skip the write-ahead log, which makes the COPY nearly as fast as
 * a bare one; after a crash PostgreSQL empties them, and an intake still waiting for apply then
 * says its staged rows are gone and must be uploaded again. Nothing applied depends on them.
 */
export class IntakeStaging1764633800000 implements MigrationInterface {
  name = 'IntakeStaging1764633800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE SCHEMA intake_staging`);
    await q.query(`ALTER TABLE intakes ADD COLUMN staging_table text CHECK (staging_table ~ '^s_[0-9a-f]{32}$')`);
    await q.query(`ALTER TABLE intakes ADD COLUMN columns text[] NOT NULL DEFAULT '{}'`);
    await q.query(`ALTER TABLE intakes ADD COLUMN delimiter text CHECK (delimiter IN (',', ';'))`);
    await q.query(`ALTER TABLE intakes ADD COLUMN restored_at timestamptz`);
    await q.query(`ALTER TABLE intakes ADD COLUMN discarded_at timestamptz`);
    await q.query(`CREATE INDEX intakes_state ON intakes (state, created_at DESC)`);
    // Case events by intake, for restore and for the intake's own counts.
    await q.query(`CREATE INDEX case_events_intake ON case_events (intake_id)`);
    await q.query(`CREATE INDEX case_events_worker ON case_events (worker_id) WHERE superseded_by IS NULL`);
    await q.query(`CREATE INDEX roster_slices_intake ON roster_slices (intake_id)`);
    // Foreign keys are checked row by row (one lookup per key per row): measured here, 161,554 roster
    // rows took 16.6 s with them and 2.4 s without. Roster entries are only ever written by the intake's
    // set-wise INSERT ... SELECT, whose joins to workers, sites and exposure groups already guarantee
    // the references; no route deletes those rows. So the per-row checks go, for this table only.
    await q.query(`ALTER TABLE roster_entries DROP CONSTRAINT roster_entries_intake_id_fkey, DROP CONSTRAINT roster_entries_worker_id_fkey,
      DROP CONSTRAINT roster_entries_site_id_fkey, DROP CONSTRAINT roster_entries_exposure_group_id_fkey`);
    await q.query(`
      CREATE TABLE run_requests (
        id bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
        requested_at timestamptz NOT NULL DEFAULT now(),
        reason text NOT NULL,
        intake_id uuid REFERENCES intakes(id),
        picked_at timestamptz
      )`);
    await q.query(`CREATE INDEX run_requests_pending ON run_requests (requested_at) WHERE picked_at IS NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE run_requests`);
    await q.query(`ALTER TABLE roster_entries ADD FOREIGN KEY (intake_id) REFERENCES intakes(id) ON DELETE CASCADE,
      ADD FOREIGN KEY (worker_id) REFERENCES workers(id), ADD FOREIGN KEY (site_id) REFERENCES sites(id),
      ADD FOREIGN KEY (exposure_group_id) REFERENCES exposure_groups(id)`);
    await q.query(`DROP INDEX roster_slices_intake`);
    await q.query(`DROP INDEX case_events_worker`);
    await q.query(`DROP INDEX case_events_intake`);
    await q.query(`DROP INDEX intakes_state`);
    await q.query(
      `ALTER TABLE intakes DROP COLUMN discarded_at, DROP COLUMN restored_at, DROP COLUMN delimiter, DROP COLUMN columns, DROP COLUMN staging_table`,
    );
    await q.query(`DROP SCHEMA intake_staging CASCADE`);
  }
}
