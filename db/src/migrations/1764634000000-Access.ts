import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Sessions in PostgreSQL (the table connect-pg-simple expects) so API processes stay stateless,
 * integration clients registered by the administrator, and people pre-provisioned by e-mail
 * before their first sign-in (subject unknown until then).
 */
export class Access1764634000000 implements MigrationInterface {
  name = 'Access1764634000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE user_sessions (
        sid varchar NOT NULL PRIMARY KEY,
        sess json NOT NULL,
        expire timestamp(6) NOT NULL
      )`);
    await q.query(`CREATE INDEX user_sessions_expire ON user_sessions (expire)`);
    await q.query(`
      CREATE TABLE integration_clients (
        client_id text PRIMARY KEY CHECK (length(client_id) BETWEEN 3 AND 128),
        name text NOT NULL,
        registered_by uuid REFERENCES users(id),
        registered_at timestamptz NOT NULL DEFAULT now(),
        revoked_by uuid REFERENCES users(id),
        revoked_at timestamptz
      )`);
    await q.query(`ALTER TABLE users ALTER COLUMN subject DROP NOT NULL`);
    await q.query(`CREATE UNIQUE INDEX users_email_unbound ON users (lower(email)) WHERE subject IS NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX users_email_unbound`);
    await q.query(`ALTER TABLE users ALTER COLUMN subject SET NOT NULL`);
    await q.query(`DROP TABLE integration_clients`);
    await q.query(`DROP TABLE user_sessions`);
  }
}
