import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Threshold notices are delivered at least once to the SMTP server and exactly once as the
 * recipient sees them. The sender records a notice as `sending` (attempt count, time, a lease in
 * `next_attempt_at`) in its own committed statement before it talks to the server, and as `sent`
 * with the server's reply after; a notice still `sending` when its lease has passed belonged to a
 * sender that died and is sent again under the same Message-ID, which the receiving side
 * collapses. The development mailbox (the SMTP fake's store) does that collapsing here: one
 * message per Message-ID and recipients, earlier duplicates removed first.
 */
export class NoticeDelivery1764634400000 implements MigrationInterface {
  name = 'NoticeDelivery1764634400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE notices DROP CONSTRAINT notices_state_check`);
    await q.query(`ALTER TABLE notices ADD CONSTRAINT notices_state_check CHECK (state IN ('pending', 'sending', 'sent', 'failed'))`);
    await q.query(`ALTER TABLE notices ADD COLUMN last_attempt_at timestamptz, ADD COLUMN server_response text`);
    await q.query(`DROP INDEX notices_due`);
    await q.query(`CREATE INDEX notices_due ON notices (next_attempt_at) WHERE state IN ('pending', 'sending')`);

    await q.query(`
      DELETE FROM dev_mailbox d USING dev_mailbox k
      WHERE d.message_id = k.message_id AND d.rcpt_to = k.rcpt_to AND d.id > k.id`);
    await q.query(`CREATE UNIQUE INDEX dev_mailbox_message_once ON dev_mailbox (message_id, rcpt_to) WHERE message_id IS NOT NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX dev_mailbox_message_once`);
    await q.query(`DROP INDEX notices_due`);
    await q.query(`CREATE INDEX notices_due ON notices (next_attempt_at) WHERE state = 'pending'`);
    await q.query(`UPDATE notices SET state = 'pending' WHERE state = 'sending'`);
    await q.query(`ALTER TABLE notices DROP COLUMN last_attempt_at, DROP COLUMN server_response`);
    await q.query(`ALTER TABLE notices DROP CONSTRAINT notices_state_check`);
    await q.query(`ALTER TABLE notices ADD CONSTRAINT notices_state_check CHECK (state IN ('pending', 'sent', 'failed'))`);
  }
}
