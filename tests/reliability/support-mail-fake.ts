import type { DataSource } from 'typeorm';
import { startFakeSmtp, type FakeSmtp, type ReceivedMessage } from '@ratewarden/worker/smtp-fake/fake-smtp-server';
import { keepInMailbox } from '@ratewarden/worker/smtp-fake/keep-in-mailbox';

/**
 * The SMTP fake on a fixed port, stopped and started at will, counting what reaches it:
 * `received` messages, of which `kept` went into the mailbox (the rest were resends of a
 * Message-ID it had). `afterKeep` runs once a message is stored and before it is acknowledged;
 * throwing there makes the fake answer with a temporary error although the mail is kept, as when
 * an acknowledgement is lost.
 */
export class MailFake {
  received = 0;
  kept = 0;
  afterKeep: ((m: ReceivedMessage) => Promise<void> | void) | null = null;
  private smtp: FakeSmtp | null = null;

  constructor(
    private readonly ds: DataSource,
    readonly port: number,
  ) {}

  async start(): Promise<void> {
    this.smtp = await startFakeSmtp({
      port: this.port,
      keep: async (m) => {
        this.received++;
        if (await keepInMailbox(this.ds, m)) this.kept++;
        await this.afterKeep?.(m);
      },
    });
  }

  async stop(): Promise<void> {
    await this.smtp?.close();
    this.smtp = null;
  }

  /** Mailbox rows per Message-ID: every one should be 1. */
  async copiesPerMessageId(): Promise<Map<string, number>> {
    const rows = (await this.ds.query(`SELECT message_id, count(*)::int AS n FROM dev_mailbox GROUP BY message_id`)) as Array<{
      message_id: string;
      n: number;
    }>;
    return new Map(rows.map((r) => [r.message_id, r.n]));
  }
}
