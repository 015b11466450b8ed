import type { DataSource } from 'typeorm';
import { DevMailboxMessageEntity, type DevMailboxMessage } from '@ratewarden/db';
import type { MailboxMessage } from '@ratewarden/shared/flags';
import { AppError } from '../../lib/app-error';

/** The columns the mailbox shows: headers only. */
type Headers = Pick<DevMailboxMessage, 'id' | 'receivedAt' | 'mailFrom' | 'rcptTo' | 'subject'>;
const headers = { id: true, receivedAt: true, mailFrom: true, rcptTo: true, subject: true } as const;

/**
 * The development mailbox is an administrator's tool for checking that mail goes out: it shows
 * the headers (sender, recipients, subject, time), never a message's text, which for a threshold
 * notice to the physician holds counts the administrator may not read.
 */
const messageOf = (m: Headers): MailboxMessage => ({
  id: String(m.id),
  receivedAt: m.receivedAt.toISOString(),
  from: m.mailFrom,
  to: m.rcptTo,
  subject: m.subject,
  text: null,
});

/** Messages the development SMTP fake kept, newest first, headers only. */
export async function listMailbox(ds: DataSource, limit = 200): Promise<MailboxMessage[]> {
  const messages = await ds.getRepository(DevMailboxMessageEntity).find({ select: headers, order: { id: 'DESC' }, take: limit });
  return messages.map(messageOf);
}

/** One kept message, headers only. */
export async function getMailboxMessage(ds: DataSource, id: string): Promise<MailboxMessage> {
  const message = await ds.getRepository(DevMailboxMessageEntity).findOne({ select: headers, where: { id } });
  if (!message) throw new AppError('not_found', 'no such message');
  return messageOf(message);
}
