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
 * The counter is raised by a deferred constraint trigger, so at the writer's commit: a reader that
 * reads the counter first and the data after never keeps older data under a newer counter, and the
 * counter row is locked only for the moment of the commit (never while an apply runs). A commit
 * locks every domain's row in one order, so two writers of different domains cannot deadlock.
 * TRUNCATE (tests) raises the counter at once.
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
    await q.query(`
      CREATE FUNCTION bump_data_version() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE
        marker text := 'ratewarden.bumped_' || TG_ARGV[0];
      BEGIN
        IF TG_LEVEL = 'ROW' AND current_setting(marker, true) = 'yes' THEN RETURN NULL; END IF;
        PERFORM 1 FROM data_versions ORDER BY domain FOR UPDATE;
        UPDATE data_versions SET version = version + 1 WHERE domain = TG_ARGV[0];
        IF TG_LEVEL = 'ROW' THEN PERFORM set_config(marker, 'yes', true); END IF;
        RETURN NULL;
      END $$`);
    for (const [domain, tables] of Object.entries(domains)) {
      for (const table of tables) {
        const name = `${table}_bumps_${domain}`;
        const changed = table === 'user_sessions' ? 'DELETE OR UPDATE OF sess' : 'INSERT OR UPDATE OR DELETE';
        await q.query(
          `CREATE CONSTRAINT TRIGGER ${name} AFTER ${changed} ON ${table} DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_data_version('${domain}')`,
        );
        await q.query(`CREATE TRIGGER ${name}_truncate AFTER TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION bump_data_version('${domain}')`);
      }
    }
  }

  async down(q: QueryRunner): Promise<void> {
    for (const [domain, tables] of Object.entries(domains)) {
      for (const table of tables) {
        await q.query(`DROP TRIGGER ${table}_bumps_${domain}_truncate ON ${table}`);
        await q.query(`DROP TRIGGER ${table}_bumps_${domain} ON ${table}`);
      }
    }
    await q.query(`DROP FUNCTION bump_data_version()`);
    await q.query(`DROP TABLE data_versions`);
  }
}
