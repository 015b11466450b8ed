import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * What an answer cache may be keyed by (api/src/lib/data-versions.ts): `data_versions` holds one
 * counter per domain, raised once by every transaction that wrote a table the domain's answers
 * are read from, whoever wrote it (an API process, the worker, a migration, psql):
 *
 * - `access`: people, their roles and sites, and their sessions (a session deleted, or its
 *   content changed; an expiry pushed forward alone does not count);
 * - `flags`: the flag list (flags, their rules, groups and sites, the current run);
 * - `periods`: the period calendar (sites, intakes, roster slices, closures, the names of the
 *   people who closed).
 *
 * A write marks its domain once per transaction (a statement trigger on each table adds a row to
 * `data_version_marks`), and a deferred constraint trigger on that row raises the counter at the
 * writer's commit: a reader that reads the counter first and the data after never keeps older
 * data under a newer counter, and the counter row is locked only for the moment of the commit
 * (never while an apply runs). A commit locks every domain's row in one order, so two writers of
 * different domains cannot deadlock. The pending trigger events sit on the marks table only, so a
 * later migration may still update a table and alter it in one transaction.
 */
const domains: Record<string, string[]> = {
  access: ['users', 'user_sites', 'user_sessions'],
  flags: ['flags', 'watch_rules', 'exposure_groups', 'sites', 'current_run'],
  periods: ['sites', 'intakes', 'roster_slices', 'period_closures', 'users'],
};

export class DataVersions1764635500000 implements MigrationInterface {
  name = 'DataVersions1764635500000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE data_versions (
        domain text PRIMARY KEY,
        version bigint NOT NULL DEFAULT 0
      )`);
    await q.query(`INSERT INTO data_versions (domain) SELECT unnest($1::text[])`, [Object.keys(domains)]);
    await q.query(`CREATE TABLE data_version_marks (domain text NOT NULL)`);
    await q.query(`
      CREATE FUNCTION mark_data_version() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE
        marker text := 'ratewarden.marked_' || TG_ARGV[0];
      BEGIN
        IF current_setting(marker, true) IS DISTINCT FROM 'yes' THEN
          INSERT INTO data_version_marks (domain) VALUES (TG_ARGV[0]);
          PERFORM set_config(marker, 'yes', true);
        END IF;
        RETURN NULL;
      END $$`);
    await q.query(`
      CREATE FUNCTION bump_data_version() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        PERFORM 1 FROM data_versions ORDER BY domain FOR NO KEY UPDATE;
        UPDATE data_versions SET version = version + 1 WHERE domain = NEW.domain;
        DELETE FROM data_version_marks WHERE domain = NEW.domain;
        RETURN NULL;
      END $$`);
    await q.query(
      `CREATE CONSTRAINT TRIGGER data_version_marks_bump AFTER INSERT ON data_version_marks DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_data_version()`,
    );
    for (const [domain, tables] of Object.entries(domains)) {
      for (const table of tables) {
        const changed = table === 'user_sessions' ? 'DELETE OR UPDATE OF sess OR TRUNCATE' : 'INSERT OR UPDATE OR DELETE OR TRUNCATE';
        await q.query(
          `CREATE TRIGGER ${table}_marks_${domain} AFTER ${changed} ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION mark_data_version('${domain}')`,
        );
      }
    }
  }

  async down(q: QueryRunner): Promise<void> {
    for (const [domain, tables] of Object.entries(domains)) {
      for (const table of tables) await q.query(`DROP TRIGGER ${table}_marks_${domain} ON ${table}`);
    }
    await q.query(`DROP TABLE data_version_marks`);
    await q.query(`DROP FUNCTION bump_data_version()`);
    await q.query(`DROP FUNCTION mark_data_version()`);
    await q.query(`DROP TABLE data_versions`);
  }
}
