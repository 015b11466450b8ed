import type { DataSource } from 'typeorm';
import type { ReceivedMessage } from './fake-smtp-server';
import { parseMessage } from './parse-message';

/** Stores one received message in `dev_mailbox`, where the API's mailbox page reads it. */
export async function keepInMailbox(ds: DataSource, m: ReceivedMessage): Promise<void> {
  const parsed = parseMessage(m.raw);
  await ds.query(
    `INSERT INTO dev_mailbox (mail_from, rcpt_to, subject, message_id, text_body, raw) VALUES ($1, $2, $3, $4, $5, $6)`,
    [m.from, m.to, parsed.subject, parsed.messageId, parsed.text, m.raw],
  );
}
