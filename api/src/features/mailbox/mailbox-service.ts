import type { DataSource } from 'typeorm';
import type { MailboxMessage } from '@ratewarden/shared/flags';
import { AppError } from '../../lib/app-error';

type Row = Record<string, any>;
const messageOf = (r: Row): MailboxMessage => ({
  id: String(r.id),
  receivedAt: new Date(r.received_at).toISOString(),
  from: r.mail_from,
  to: r.rcpt_to,
  subject: r.subject,
  text: r.text_body,
});

/** Messages the development SMTP fake kept, newest first. */
export async function listMailbox(ds: DataSource, limit = 200): Promise<MailboxMessage[]> {
  const rows: Row[] = await ds.query(`SELECT id, received_at, mail_from, rcpt_to, subject, text_body FROM dev_mailbox ORDER BY id DESC LIMIT $1`, [limit]);
  return rows.map(messageOf);
}

/** One kept message with its raw source. */
export async function getMailboxMessage(ds: DataSource, id: string): Promise<MailboxMessage & { raw: string }> {
  const rows: Row[] = await ds.query(`SELECT * FROM dev_mailbox WHERE id = $1`, [id]);
  if (!rows[0]) throw new AppError('not_found', 'no such message');
  return { ...messageOf(rows[0]), raw: rows[0].raw };
}
