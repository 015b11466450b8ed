import nodemailer, { type Transporter } from 'nodemailer';
import type { DataSource } from 'typeorm';

export interface SenderSettings {
  smtpHost: string;
  smtpPort: number;
  smtpSecure: boolean;
  smtpUser?: string;
  smtpPass?: string;
  from: string;
  retryBaseMs: number;
  retryMaxMs: number;
  maxAttempts: number;
}

export function createTransport(s: SenderSettings): Transporter {
  return nodemailer.createTransport({
    host: s.smtpHost,
    port: s.smtpPort,
    secure: s.smtpSecure,
    // The loopback fake offers no TLS; a real server configured with SMTP_SECURE uses it.
    ignoreTLS: !s.smtpSecure,
    auth: s.smtpUser ? { user: s.smtpUser, pass: s.smtpPass ?? '' } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
}

/** Delay before attempt n + 1 after n failed attempts: base × 2^(n − 1), capped. */
export function retryDelayMs(failedAttempts: number, s: Pick<SenderSettings, 'retryBaseMs' | 'retryMaxMs'>): number {
  return Math.min(s.retryMaxMs, s.retryBaseMs * 2 ** Math.max(0, failedAttempts - 1));
}

interface DueNotice {
  id: string;
  recipient: string;
  subject: string;
  body: string;
  attempts: number;
}

/**
 * Delivers due notices from the outbox, one at a time, each inside its own transaction that
 * holds the notice's row lock (FOR UPDATE SKIP LOCKED): concurrent senders never pick the same
 * notice, and a notice is marked sent in the same transaction that claimed it, so it is sent once.
 * A failure records the error and schedules the next attempt with exponential backoff; after
 * `maxAttempts` the notice is marked failed (shown on the flag). Returns how many were sent.
 */
export async function sendDueNotices(ds: DataSource, transport: Transporter, s: SenderSettings, limit = 50): Promise<{ sent: number; failed: number }> {
  let sent = 0;
  let failed = 0;
  for (let i = 0; i < limit; i++) {
    const done = await ds.transaction(async (em) => {
      const rows: DueNotice[] = await em.query(
        `SELECT id, recipient, subject, body, attempts FROM notices
         WHERE state = 'pending' AND next_attempt_at <= now()
         ORDER BY next_attempt_at, created_at LIMIT 1 FOR UPDATE SKIP LOCKED`,
      );
      const n = rows[0];
      if (!n) return 'none' as const;
      try {
        const info = await transport.sendMail({ from: s.from, to: n.recipient, subject: n.subject, text: n.body });
        await em.query(`UPDATE notices SET state = 'sent', attempts = attempts + 1, sent_at = now(), message_id = $2, last_error = NULL WHERE id = $1`, [n.id, info.messageId ?? null]);
        return 'sent' as const;
      } catch (err) {
        const attempts = n.attempts + 1;
        const message = (err instanceof Error ? err.message : String(err)).slice(0, 500);
        const giveUp = attempts >= s.maxAttempts;
        await em.query(
          `UPDATE notices SET attempts = $2, last_error = $3, state = $4, next_attempt_at = now() + make_interval(secs => $5::double precision / 1000) WHERE id = $1`,
          [n.id, attempts, message, giveUp ? 'failed' : 'pending', retryDelayMs(attempts, s)],
        );
        return 'failed' as const;
      }
    });
    if (done === 'none') break;
    if (done === 'sent') sent++;
    else failed++;
  }
  return { sent, failed };
}
