import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A later case list that disagrees with a physician's decision does not overwrite it silently:
 * the check records each case whose current version is a decision (`case_events.review_id`) and
 * whose status the list gives otherwise, and a physician resolves each one: `keep` the decision
 * (the list's row for that case is not applied) or `accept` the list's status. The intake cannot
 * be applied while one is unresolved.
 */
export class IntakeCaseConflicts1764635030000 implements MigrationInterface {
  name = 'IntakeCaseConflicts1764635030000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE intake_case_conflicts (
        intake_id uuid NOT NULL REFERENCES intakes(id) ON DELETE CASCADE,
        case_ref text NOT NULL,
        review_id bigint NOT NULL REFERENCES case_reviews(id),
        decided_status text NOT NULL CHECK (decided_status IN ('suspected', 'confirmed', 'ruled_out')),
        list_status text NOT NULL CHECK (list_status IN ('suspected', 'confirmed', 'ruled_out')),
        resolution text CHECK (resolution IN ('keep', 'accept')),
        resolved_by uuid REFERENCES users(id),
        resolved_at timestamptz,
        PRIMARY KEY (intake_id, case_ref),
        CHECK ((resolution IS NULL) = (resolved_at IS NULL))
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE intake_case_conflicts`);
  }
}
