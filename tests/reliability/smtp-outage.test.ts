import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { retryDelayMs } from '@ratewarden/worker/notices/notice-sender';
import { noticeCohort, raiseNotices } from '../integration/notices-fixture';
import { clearCohortData } from '../integration/runs-fixture';
import { freePort } from '../support/free-port';
import { provisionUser } from '../support/sign-in';
import { openTestDataSource, testDatabaseUrl } from '../support/test-db';
import { MailFake } from './support-mail-fake';
import { killHard, startChild, until, type Child } from './support-processes';

const RETRY = { retryBaseMs: 200, retryMaxMs: 800 };
const LOST_ACKNOWLEDGEMENTS = 4;

/**
 * The SMTP server is down while threshold notices are due, then back but losing its first
 * acknowledgements; the worker's sender retries with backoff throughout, and when the server
 * works again every notice is in the mailbox exactly once.
 */
describe('an SMTP outage while notices are due', () => {
  let ds: DataSource;
  let fake: MailFake;
  let worker: Child | null = null;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician');
    fake = new MailFake(ds, await freePort());
  });
  afterAll(async () => {
    if (worker) await killHard(worker.process);
    await fake.stop();
    await ds.destroy();
  });

  it('retries with backoff while the server is away and delivers every notice once when it returns', async () => {
    const c = await noticeCohort(ds);
    const recipients = Array.from({ length: 5 }, (_, i) => `outage-${i}-${c.tag.toLowerCase()}@kestrelmoor.test`);
    await raiseNotices(ds, c, `outage ${c.tag}`, recipients);
    const notices = (await ds.query(`SELECT id, message_id FROM notices`)) as Array<{ id: string }>;
    expect(notices).toHaveLength(6); // the five recipients and the physician

    worker = startChild('worker/src/main.ts', {
      DATABASE_URL: testDatabaseUrl(),
      SMTP_PORT: String(fake.port),
      NOTICE_POLL_MS: '100',
      RUN_POLL_MS: '600000',
      NOTICE_RETRY_BASE_MS: String(RETRY.retryBaseMs),
      NOTICE_RETRY_MAX_MS: String(RETRY.retryMaxMs),
      NOTICE_SENDING_LEASE_MS: '5000',
    });

    // Down: nothing listens. Every notice is tried, fails, and is put back with a growing delay.
    const down = await until('every notice to have failed three times', async () => {
      const rows = (await ds.query(`SELECT state, attempts, last_error, last_attempt_at, next_attempt_at FROM notices`)) as Array<{
        state: string;
        attempts: number;
        last_error: string | null;
        last_attempt_at: Date;
        next_attempt_at: Date;
      }>;
      return rows.every((r) => r.state === 'pending' && r.attempts >= 3) && rows;
    });
    for (const n of down) {
      expect(n.last_error).toMatch(/ECONNREFUSED|connect/i);
      // The next attempt waits at least the backoff of this many failures after the last one began.
      expect(n.next_attempt_at.getTime() - n.last_attempt_at.getTime()).toBeGreaterThanOrEqual(retryDelayMs(n.attempts, RETRY));
    }
    const failedWhileDown = down.reduce((t, n) => t + n.attempts, 0);
    expect(await ds.query(`SELECT count(*)::int AS n FROM dev_mailbox`)).toEqual([{ n: 0 }]);

    // Back, but the first acknowledgements are lost: the mail is kept, the sender is told it failed.
    let lost = 0;
    fake.afterKeep = () => {
      if (lost < LOST_ACKNOWLEDGEMENTS) {
        lost++;
        throw new Error('acknowledgement lost');
      }
    };
    await fake.start();
    await until('every notice to be sent', async () => {
      const [row] = (await ds.query(`SELECT count(*) FILTER (WHERE state = 'sent')::int AS sent FROM notices`)) as Array<{ sent: number }>;
      return row!.sent === notices.length;
    });

    const copies = await fake.copiesPerMessageId();
    const ids = (await ds.query(`SELECT message_id FROM notices ORDER BY id`)) as Array<{ message_id: string }>;
    expect(ids.map((n) => copies.get(n.message_id))).toEqual(notices.map(() => 1));
    expect(await ds.query(`SELECT count(*)::int AS n FROM dev_mailbox`)).toEqual([{ n: notices.length }]);
    expect(fake.kept).toBe(notices.length);
    // Each lost acknowledgement made the sender try again, and the fake dropped the resend.
    expect(fake.received).toBe(notices.length + LOST_ACKNOWLEDGEMENTS);
    console.log(
      `reliability: SMTP outage with ${notices.length} notices due: ${failedWhileDown} failed attempts while down (backoff ${RETRY.retryBaseMs} ms doubling to ${RETRY.retryMaxMs} ms), then ${LOST_ACKNOWLEDGEMENTS} acknowledgements lost; ${fake.received} deliveries received, ${fake.kept} kept, each notice once`,
    );
  });
});
