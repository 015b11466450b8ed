import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A watch rule may not select groups on a small count: with minimum case counts of 1 to 4 beside
 * one another, which rule raised a flag told a reader the count the results withhold. Rules
 * stored with a smaller minimum are raised to 5 (the default SMALL_CELL_THRESHOLD; the API refuses
 * less than the configured threshold), each change written to the audit log, and 5 becomes the
 * column's default.
 *
 * No down: lowering the minima again would reopen the leak, and the audit log keeps what each was.
 */
export class WatchRuleMinCases1764634300000 implements MigrationInterface {
  name = 'WatchRuleMinCases1764634300000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      WITH raised AS (
        UPDATE watch_rules w SET min_cases = 5, updated_at = now()
          FROM watch_rules old WHERE old.id = w.id AND w.min_cases < 5
        RETURNING w.id, old.min_cases AS before
      )
      INSERT INTO audit_events (actor_label, action, target, detail)
      SELECT 'migration', 'rule.update', 'watch_rule:' || id,
             jsonb_build_object('before', jsonb_build_object('minCases', before), 'after', jsonb_build_object('minCases', 5),
                                'reason', 'minimum case count raised to the small-cell threshold')
        FROM raised`);
    await q.query(`ALTER TABLE watch_rules ALTER COLUMN min_cases SET DEFAULT 5`);
  }

  async down(): Promise<void> {
    // Deliberately none: see the class comment.
  }
}
