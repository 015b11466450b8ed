import type { DataSource } from 'typeorm';
import type { ReceivedMessage } from './fake-smtp-server';
import { parseMessage } from './parse-message';

/**
 * Stores one received message in `dev_mailbox`, where the API's mailbox page reads it. A message
 * whose Message-ID the mailbox already holds for the same recipients is a resend of one it has
 * (the sender never got the acknowledgement) and is dropped, as mail servers and clients
 * collapse duplicate Message-IDs; it is still acknowledged. Returns whether it was kept.
 */
export async function keepInMailbox(ds: DataSource, m: ReceivedMessage): Promise<boolean> {
  const parsed = parseMessage(m.raw);
  const inserted = (await ds.query(
    `INSERT INTO dev_mailbox (mail_from, rcpt_to, subject, message_id, text_body, raw) VALUES ($1, $2, $3, $4, $5, $6)
     ON CONFLICT (message_id, rcpt_to) WHERE message_id IS NOT NULL DO NOTHING RETURNING id`,
    [m.from, m.to, parsed.subject, parsed.messageId, parsed.text, m.raw],
  )) as unknown[];
  return inserted.length > 0;
}
