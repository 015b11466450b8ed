import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Batched runs. An intake's run request waits until uploads have settled: the worker runs once no
 * request has come for `RUN_QUIET_SECONDS` (worker/src/runs/request-poller.ts), so a roster and
 * its case list uploaded together give one run. `immediate` marks the requests that do not wait:
 * the hygienist's run button (and a run asked for on someone's behalf, such as the demo's first).
 * Requests written before this migration wait like an intake's.
 */
export class RunRequestImmediate1764634700000 implements MigrationInterface {
  name = 'RunRequestImmediate1764634700000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE run_requests ADD COLUMN immediate boolean NOT NULL DEFAULT false`);
    // Runs stored before reporting periods say nothing of which periods were complete: a new one does.
    await q.query(
      `INSERT INTO run_requests (reason, immediate) SELECT 'reporting periods: a new run states which periods are complete', true WHERE EXISTS (SELECT 1 FROM runs)`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE run_requests DROP COLUMN immediate`);
  }
}
