import { EntitySchema } from 'typeorm';

/** A message the development SMTP fake received (development and tests only). */
export interface DevMailboxMessage {
  id: string;
  receivedAt: Date;
  mailFrom: string | null;
  rcptTo: string[];
  subject: string | null;
  messageId: string | null;
  textBody: string | null;
  raw: string;
}

export const DevMailboxMessageEntity = new EntitySchema<DevMailboxMessage>({
  name: 'DevMailboxMessage',
  tableName: 'dev_mailbox',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    receivedAt: { name: 'received_at', type: 'timestamptz', createDate: true },
    mailFrom: { name: 'mail_from', type: 'text', nullable: true },
    rcptTo: { name: 'rcpt_to', type: 'text', array: true },
    subject: { type: 'text', nullable: true },
    messageId: { name: 'message_id', type: 'text', nullable: true },
    textBody: { name: 'text_body', type: 'text', nullable: true },
    raw: { type: 'text' },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  indices: [{ name: 'dev_mailbox_message_once', columns: ['messageId', 'rcptTo'], unique: true, where: '(message_id IS NOT NULL)' }],
});
