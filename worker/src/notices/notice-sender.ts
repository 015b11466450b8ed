import nodemailer, { type Transporter } from 'nodemailer';
import type { DataSource } from 'typeorm';
import { NoticeEntity } from '@ratewarden/db';
import { claimNextNotice, type ClaimedNotice } from './claim-notice';

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
  /** How long a notice stays `sending` before another sender may take it over (its sender died). */
  sendingLeaseMs: number;
}

/** What the sender needs of a nodemailer transport (tests wrap one to fail at chosen moments). */
export type NoticeTransport = Pick<Transporter, 'sendMail'>;

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

/** One SMTP conversation for a claimed notice, then its outcome recorded. */
async function deliver(ds: DataSource, transport: NoticeTransport, s: SenderSettings, n: ClaimedNotice): Promise<'sent' | 'failed'> {
  try {
    const info = await transport.sendMail({ from: s.from, to: n.recipient, subject: n.subject, text: n.body, messageId: n.messageId });
    // Only a notice still `sending` is marked: a sender that took over after the lease may have marked it already.
    await ds.getRepository(NoticeEntity).update(
      { id: n.id, state: 'sending' },
      {
        state: 'sent',
        sentAt: () => 'now()',
        serverResponse: String((info as { response?: unknown }).response ?? '').slice(0, 500) || null,
        lastError: null,
      },
    );
    return 'sent';
  } catch (err) {
    const message = (err instanceof Error ? err.message : String(err)).slice(0, 500);
    const giveUp = n.attempts >= s.maxAttempts;
    // The next attempt's time is reckoned on the database's clock, as the claim's lease is.
    await ds.query(
      `UPDATE notices SET state = $3, last_error = $2, next_attempt_at = now() + make_interval(secs => $4::double precision / 1000)
       WHERE id = $1 AND state = 'sending'`,
      [n.id, message, giveUp ? 'failed' : 'pending', retryDelayMs(n.attempts, s)],
    );
    return 'failed';
  }
}

/**
 * Delivers due notices from the outbox, one at a time: at least once to the SMTP server, and
 * exactly once as the recipient sees it. Each notice is recorded as `sending` (committed) before
 * the SMTP conversation and as `sent`, with the server's reply, after it; a crash in between
 * leaves it `sending`, and once its lease has passed it is sent again with the same Message-ID
 * (`<notice-<id>@ratewarden.local>`), which the receiving side collapses into the copy it has.
 * A failure records the error and schedules the next attempt with exponential backoff; after
 * `maxAttempts` the notice is marked failed (shown on the flag).
 */
export async function sendDueNotices(ds: DataSource, transport: NoticeTransport, s: SenderSettings, limit = 50): Promise<{ sent: number; failed: number }> {
  let sent = 0;
  let failed = 0;
  for (let i = 0; i < limit; i++) {
    const claim = await claimNextNotice(ds, s);
    if (claim.kind === 'none') break;
    if (claim.kind === 'exhausted' || (await deliver(ds, transport, s, claim.notice)) === 'failed') failed++;
    else sent++;
  }
  return { sent, failed };
}
