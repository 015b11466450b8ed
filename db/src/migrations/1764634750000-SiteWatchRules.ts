import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Site-level watch rules and follow-up notices.
 *
 * - `watch_rules.site_ids`: null for a company-wide rule (every rule before this migration), else
 *   the sites the rule watches, each on its own result rows (no foreign key on an array: the API
 *   checks the ids).
 * - `flags.site_id`: the scope a flag was raised in, null for the company. At most one open flag
 *   per rule × group × outcome × scope.
 * - `flag_events.kind` gains `eased` (a later run withdrew an escalation: the value fell back to
 *   or below its level before it) and `crossed_again` (an open flag that had dropped below its
 *   rule is past it again); with `cleared` they carry follow-up notices.
 */
export class SiteWatchRules1764634750000 implements MigrationInterface {
  name = 'SiteWatchRules1764634750000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(
      `ALTER TABLE watch_rules ADD COLUMN site_ids integer[] CHECK (site_ids IS NULL OR (cardinality(site_ids) > 0 AND array_position(site_ids, NULL) IS NULL))`,
    );
    await q.query(`ALTER TABLE flags ADD COLUMN site_id integer REFERENCES sites(id)`);
    await q.query(`DROP INDEX flags_one_open`);
    // Site ids start at 1, so 0 stands for the company in the key.
    await q.query(`CREATE UNIQUE INDEX flags_one_open ON flags (rule_id, exposure_group_id, outcome_id, coalesce(site_id, 0)) WHERE state <> 'closed'`);
    await q.query(`CREATE INDEX flags_site ON flags (site_id) WHERE site_id IS NOT NULL`);
    await q.query(`ALTER TABLE flag_events DROP CONSTRAINT flag_events_kind_check`);
    await q.query(
      `ALTER TABLE flag_events ADD CONSTRAINT flag_events_kind_check CHECK (kind IN ('raised', 'updated', 'escalated', 'eased', 'cleared', 'crossed_again', 'review_started', 'closed'))`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    // A table without scopes cannot hold site flags or the follow-up events: refuse rather than lose them.
    const [left]: Array<{ n: number }> = await q.query(
      `SELECT (SELECT count(*) FROM flags WHERE site_id IS NOT NULL) + (SELECT count(*) FROM flag_events WHERE kind IN ('eased', 'crossed_again'))::int AS n`,
    );
    if (Number(left?.n ?? 0) > 0) throw new Error('site flags or follow-up events exist: they cannot be kept without this migration');
    await q.query(`ALTER TABLE flag_events DROP CONSTRAINT flag_events_kind_check`);
    await q.query(
      `ALTER TABLE flag_events ADD CONSTRAINT flag_events_kind_check CHECK (kind IN ('raised', 'updated', 'escalated', 'cleared', 'review_started', 'closed'))`,
    );
    await q.query(`DROP INDEX flags_site`);
    await q.query(`DROP INDEX flags_one_open`);
    await q.query(`ALTER TABLE flags DROP COLUMN site_id`);
    await q.query(`CREATE UNIQUE INDEX flags_one_open ON flags (rule_id, exposure_group_id, outcome_id) WHERE state <> 'closed'`);
    await q.query(`ALTER TABLE watch_rules DROP COLUMN site_ids`);
  }
}
