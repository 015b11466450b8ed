import type { DataSource } from 'typeorm';
import type { MailboxMessage } from '@ratewarden/shared/flags';
import { AppError } from '../../lib/app-error';

type Row = Record<string, any>;

/**
 * The development mailbox is an administrator's tool for checking that mail goes out: it shows
 * the headers (sender, recipients, subject, time), never a message's text, which for a threshold
 * notice to the physician holds counts the administrator may not read.
 */
const messageOf = (r: Row): MailboxMessage => ({
  id: String(r.id),
  receivedAt: new Date(r.received_at).toISOString(),
  from: r.mail_from,
  to: r.rcpt_to,
  subject: r.subject,
  text: null,
});

/** Messages the development SMTP fake kept, newest first, headers only. */
export async function listMailbox(ds: DataSource, limit = 200): Promise<MailboxMessage[]> {
  const rows: Row[] = await ds.query(`SELECT id, received_at, mail_from, rcpt_to, subject FROM dev_mailbox ORDER BY id DESC LIMIT $1`, [limit]);
  return rows.map(messageOf);
}

/** One kept message, headers only. */
export async function getMailboxMessage(ds: DataSource, id: string): Promise<MailboxMessage> {
  const rows: Row[] = await ds.query(`SELECT id, received_at, mail_from, rcpt_to, subject FROM dev_mailbox WHERE id = $1`, [id]);
  if (!rows[0]) throw new AppError('not_found', 'no such message');
  return messageOf(rows[0]);
}
