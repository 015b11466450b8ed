import { EntitySchema } from 'typeorm';

/**
 * One threshold notice to one recipient, read in their inbox, and in the outbox until the sender has delivered it:
 * pending → sending (recorded before the SMTP conversation) → sent (with the server's reply), or
 * back to pending with a later `nextAttemptAt`, or failed after the last allowed attempt. While
 * `sending`, `nextAttemptAt` is the lease after which another sender may take the notice over.
 */
export interface NoticeRow {
  id: string;
  flagId: string;
  flagEventId: string;
  recipient: string;
  subject: string;
  body: string;
  state: 'pending' | 'sending' | 'sent' | 'failed';
  attempts: number;
  nextAttemptAt: Date;
  lastError: string | null;
  lastAttemptAt: Date | null;
  serverResponse: string | null;
  messageId: string | null;
  createdAt: Date;
  sentAt: Date | null;
  /** What the e-mail says: that there is a notice, with the inbox link (null: notices written before the inbox, mailed with their body). */
  mailSubject: string | null;
  mailBody: string | null;
  /** The flag event's kind, period and completeness, for the inbox's filters. */
  kind: 'raised' | 'escalated' | 'eased' | 'cleared' | 'crossed_again' | null;
  period: string | null;
  completeness: 'complete' | 'partial' | null;
  /** When the recipient first opened it in the inbox; null: new. */
  readAt: Date | null;
}

export const NoticeEntity = new EntitySchema<NoticeRow>({
  name: 'Notice',
  tableName: 'notices',
  columns: {
    id: { type: 'uuid', primary: true, generated: 'uuid' },
    flagId: { name: 'flag_id', type: 'uuid' },
    flagEventId: { name: 'flag_event_id', type: 'bigint' },
    recipient: { type: 'text' },
    subject: { type: 'text' },
    body: { type: 'text' },
    state: { type: 'text', default: 'pending' },
    attempts: { type: 'integer', default: 0 },
    nextAttemptAt: { name: 'next_attempt_at', type: 'timestamptz', default: () => 'now()' },
    lastError: { name: 'last_error', type: 'text', nullable: true },
    lastAttemptAt: { name: 'last_attempt_at', type: 'timestamptz', nullable: true },
    serverResponse: { name: 'server_response', type: 'text', nullable: true },
    messageId: { name: 'message_id', type: 'text', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    sentAt: { name: 'sent_at', type: 'timestamptz', nullable: true },
    mailSubject: { name: 'mail_subject', type: 'text', nullable: true },
    mailBody: { name: 'mail_body', type: 'text', nullable: true },
    kind: { type: 'text', nullable: true },
    period: { type: 'date', nullable: true },
    completeness: { type: 'text', nullable: true },
    readAt: { name: 'read_at', type: 'timestamptz', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  uniques: [{ name: 'notices_flag_event_id_recipient_key', columns: ['flagEventId', 'recipient'] }],
  checks: [
    { name: 'notices_completeness_check', expression: "(completeness = ANY (ARRAY['complete'::text, 'partial'::text]))" },
    {
      name: 'notices_kind_check',
      expression: "(kind = ANY (ARRAY['raised'::text, 'escalated'::text, 'eased'::text, 'cleared'::text, 'crossed_again'::text]))",
    },
    { name: 'notices_state_check', expression: "(state = ANY (ARRAY['pending'::text, 'sending'::text, 'sent'::text, 'failed'::text]))" },
  ],
  indices: [
    { name: 'notices_due', columns: ['nextAttemptAt'], where: "(state = ANY (ARRAY['pending'::text, 'sending'::text]))" },
    { name: 'notices_recipient', columns: ['createdAt'], synchronize: false },
  ],
  foreignKeys: [
    { name: 'notices_flag_event_id_fkey', target: 'FlagEvent', columnNames: ['flag_event_id'], referencedColumnNames: ['id'] },
    { name: 'notices_flag_id_fkey', target: 'Flag', columnNames: ['flag_id'], referencedColumnNames: ['id'] },
  ],
});
