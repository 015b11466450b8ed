import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The notices inbox: every threshold notice is read inside Ratewarden by its recipient, and the
 * e-mail only says that there is one, with a link (no rule, group or figure in the mail).
 *
 * - `subject` and `body` stay the notice as the inbox shows it; `mail_subject` and `mail_body` are
 *   what goes out by e-mail (null for notices written before: those went out with their body).
 * - `kind`, `period` and `completeness` are the flag event's, for the inbox's filters; backfilled
 *   from the flag events of notices written before.
 * - `read_at`: when the recipient first opened it in the inbox (new until then).
 */
export class NoticeInbox1764635010000 implements MigrationInterface {
  name = 'NoticeInbox1764635010000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      ALTER TABLE notices
        ADD COLUMN mail_subject text,
        ADD COLUMN mail_body text,
        ADD COLUMN kind text CHECK (kind IN ('raised', 'escalated', 'eased', 'cleared', 'crossed_again')),
        ADD COLUMN period date,
        ADD COLUMN completeness text CHECK (completeness IN ('complete', 'partial')),
        ADD COLUMN read_at timestamptz`);
    await q.query(`
      UPDATE notices n SET kind = e.kind, period = (e.detail->>'period')::date,
        completeness = coalesce(e.detail->>'completeness', f.detail->>'completeness')
      FROM flag_events e JOIN flags f ON f.id = e.flag_id
      WHERE e.id = n.flag_event_id AND e.kind IN ('raised', 'escalated', 'eased', 'cleared', 'crossed_again')`);
    await q.query(`CREATE INDEX notices_recipient ON notices (lower(recipient), created_at DESC)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX notices_recipient`);
    await q.query(
      `ALTER TABLE notices DROP COLUMN mail_subject, DROP COLUMN mail_body, DROP COLUMN kind, DROP COLUMN period, DROP COLUMN completeness, DROP COLUMN read_at`,
    );
  }
}
