import type { DataSource } from 'typeorm';
import { NoticeEntity, rows } from '@ratewarden/db';
import { noticeMessageId } from './message-id';

export interface ClaimedNotice {
  id: string;
  recipient: string;
  subject: string;
  body: string;
  /** This attempt's number, counted from 1. */
  attempts: number;
  messageId: string;
}

export type Claim = { kind: 'none' } | { kind: 'exhausted'; id: string } | { kind: 'claimed'; notice: ClaimedNotice };

/**
 * Takes the next due notice and records, committed before any mail goes out, that it is being
 * sent: state `sending`, the attempt's number and time, its Message-ID, and a lease until which
 * no other sender takes it (`next_attempt_at`). Due are pending notices whose backoff has passed
 * and `sending` ones whose lease has passed: their sender died between claiming and recording
 * the outcome, so the mail may or may not have gone out, and it is sent again under the same
 * Message-ID. Row locks (SKIP LOCKED) keep two senders from claiming one notice at once.
 * A notice whose sender died during its last allowed attempt is marked failed instead. What goes
 * out is the notice's e-mail (`mail_subject`, `mail_body`: a link to the inbox), or for a notice
 * written before the inbox, its text.
 */
export async function claimNextNotice(ds: DataSource, s: { sendingLeaseMs: number; maxAttempts: number }): Promise<Claim> {
  return ds.transaction(async (em): Promise<Claim> => {
    // The claim stays SQL: a row lock that skips rows other senders hold, and a lease on the database's clock.
    const due: Array<{ id: string; attempts: number }> = await em.query(
      `SELECT id, attempts FROM notices
       WHERE state IN ('pending', 'sending') AND next_attempt_at <= now()
       ORDER BY next_attempt_at, created_at LIMIT 1 FOR UPDATE SKIP LOCKED`,
    );
    const n = due[0];
    if (!n) return { kind: 'none' };
    if (n.attempts >= s.maxAttempts) {
      await em.getRepository(NoticeEntity).update(n.id, { state: 'failed', lastError: 'the sender stopped during the last allowed attempt; delivery unknown' });
      return { kind: 'exhausted', id: n.id };
    }
    const [row] = await rows<{ recipient: string; subject: string; body: string; attempts: number; message_id: string }>(
      em,
      `UPDATE notices SET state = 'sending', attempts = attempts + 1, last_attempt_at = now(),
         next_attempt_at = now() + make_interval(secs => $3::double precision / 1000), message_id = coalesce(message_id, $2)
       WHERE id = $1 RETURNING recipient, coalesce(mail_subject, subject) AS subject, coalesce(mail_body, body) AS body, attempts, message_id`,
      [n.id, noticeMessageId(n.id), s.sendingLeaseMs],
    );
    return {
      kind: 'claimed',
      notice: { id: n.id, recipient: row!.recipient, subject: row!.subject, body: row!.body, attempts: row!.attempts, messageId: row!.message_id },
    };
  });
}
