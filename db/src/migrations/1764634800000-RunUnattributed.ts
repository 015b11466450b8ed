import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The counted cases a run could not attribute to any roster row, one row per case event, with
 * Ratewarden's reason (worker/src/runs/cells-query.ts, UNATTRIBUTED_SQL): `no_roster_month` (no
 * roster row with hours for the worker in the onset month after the lag), `removed_by_correction`
 * (a superseded version of that site × month had one), `lag_outside_data` (the lagged month lies
 * before the first rostered month, or the onset after the last). Read from the same snapshot as
 * the run's cells, so per outcome these rows and the cells' cases add up to the cases counted.
 * Case-level: listed to the physician only; everyone else gets counts by reason.
 */
export class RunUnattributed1764634800000 implements MigrationInterface {
  name = 'RunUnattributed1764634800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE run_unattributed (
        run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
        case_event_id bigint NOT NULL REFERENCES case_events(id) ON DELETE CASCADE,
        outcome_id integer NOT NULL,
        reason text NOT NULL CHECK (reason IN ('no_roster_month', 'removed_by_correction', 'lag_outside_data')),
        PRIMARY KEY (run_id, case_event_id)
      )`);
    await q.query(`CREATE INDEX run_unattributed_case ON run_unattributed (case_event_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE run_unattributed`);
  }
}
