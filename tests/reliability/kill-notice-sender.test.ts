import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { noticeCohort, raiseNotices } from '../integration/notices-fixture';
import { clearCohortData } from '../integration/runs-fixture';
import { freePort } from '../support/free-port';
import { provisionUser } from '../support/sign-in';
import { openTestDataSource, testDatabaseUrl } from '../support/test-db';
import { MailFake } from './support-mail-fake';
import { exited, killHard, startChild, until, type Child } from './support-processes';

const LEASE_MS = 1_000;
const ROUNDS = 3;

/**
 * kill -9 of the notice sender between the SMTP conversation and the outbox's record of it, in
 * both places a crash can fall: the worker killed once the server has the mail but before it
 * answered, and a sender that kills itself right after the server's acknowledgement. Restarted,
 * the sender resends what it had not recorded, and the mailbox holds one message per notice.
 */
describe('kill -9 of the notice sender between send and record', () => {
  let ds: DataSource;
  let fake: MailFake;
  let child: Child | null = null;
  const env = () => ({
    DATABASE_URL: testDatabaseUrl(),
    SMTP_PORT: String(fake.port),
    NOTICE_POLL_MS: '100',
    RUN_POLL_MS: '600000',
    NOTICE_RETRY_BASE_MS: '100',
    NOTICE_SENDING_LEASE_MS: String(LEASE_MS),
  });

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician');
    fake = new MailFake(ds, await freePort());
    await fake.start();
  });
  afterAll(async () => {
    if (child) await killHard(child.process);
    await fake.stop();
    await ds.destroy();
  });

  it('leaves each interrupted notice sending with its mail delivered, and the restarted sender completes it without a second copy', async () => {
    const c = await noticeCohort(ds);
    const recipients = Array.from({ length: 2 * ROUNDS + 1 }, (_, i) => `killed-${i}-${c.tag.toLowerCase()}@kestrelmoor.test`);
    await raiseNotices(ds, c, `killed sender ${c.tag}`, recipients);
    const total = recipients.length + 1; // and the physician
    let kills = 0;

    for (let round = 0; round < ROUNDS; round++) {
      // The worker, killed by the server side once the mail is kept and before it is acknowledged.
      child = startChild('worker/src/main.ts', env());
      const worker = child.process;
      fake.afterKeep = async () => {
        fake.afterKeep = null;
        await killHard(worker);
        throw new Error('the sender is gone');
      };
      await exited(worker);
      expect(worker.signalCode).toBe('SIGKILL');
      kills++;

      // A sender that kills itself right after the acknowledgement, before recording it.
      child = startChild('tests/reliability/support-sender-child.ts', { DATABASE_URL: testDatabaseUrl() }, [String(fake.port), String(LEASE_MS)]);
      await exited(child.process);
      expect(child.process.signalCode, child.output()).toBe('SIGKILL');
      kills++;

      // Each kill left a notice `sending` whose mail is already in the mailbox.
      const sending = (await ds.query(
        `SELECT n.message_id, (SELECT count(*)::int FROM dev_mailbox d WHERE d.message_id = n.message_id) AS copies FROM notices n WHERE n.state = 'sending'`,
      )) as Array<{ message_id: string; copies: number }>;
      expect(sending.length).toBeGreaterThanOrEqual(1);
      expect(sending.every((s) => s.copies === 1)).toBe(true);
    }
    const interrupted = (await ds.query(`SELECT count(*)::int AS n FROM notices WHERE state = 'sending'`)) as Array<{ n: number }>;

    // Restarted and left alone, the sender finishes: the interrupted notices after their lease.
    child = startChild('worker/src/main.ts', env());
    await until('every notice to be sent', async () => {
      const [row] = (await ds.query(`SELECT count(*) FILTER (WHERE state = 'sent')::int AS sent FROM notices`)) as Array<{ sent: number }>;
      return row!.sent === total;
    });
    await killHard(child.process);
    child = null;

    const copies = await fake.copiesPerMessageId();
    const ids = (await ds.query(`SELECT message_id FROM notices`)) as Array<{ message_id: string }>;
    expect(ids.map((n) => copies.get(n.message_id))).toEqual(ids.map(() => 1));
    expect(await ds.query(`SELECT count(*)::int AS n FROM dev_mailbox`)).toEqual([{ n: total }]);
    expect(fake.kept).toBe(total);
    const resent = (await ds.query(`SELECT count(*)::int AS n FROM notices WHERE attempts >= 2`)) as Array<{ n: number }>;
    expect(resent[0]!.n).toBeGreaterThanOrEqual(interrupted[0]!.n);
    expect(fake.received).toBeGreaterThan(total);
    console.log(
      `reliability: kill -9 of the notice sender between send and record: ${kills} kills (${ROUNDS} before the server's answer, ${ROUNDS} after it), ${total} notices, ${fake.received} deliveries received, ${fake.kept} kept, each notice once`,
    );
  });
});
