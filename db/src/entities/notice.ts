import { EntitySchema } from 'typeorm';

/** One threshold notice to one recipient, in the outbox until the sender has delivered it. */
export interface NoticeRow {
  id: string;
  flagId: string;
  flagEventId: string;
  recipient: string;
  subject: string;
  body: string;
  state: 'pending' | 'sent' | 'failed';
  attempts: number;
  nextAttemptAt: Date;
  lastError: string | null;
  messageId: string | null;
  createdAt: Date;
  sentAt: Date | null;
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
    messageId: { name: 'message_id', type: 'text', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
    sentAt: { name: 'sent_at', type: 'timestamptz', nullable: true },
  },
});
