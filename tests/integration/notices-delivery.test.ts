import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { watchRuleInputSchema } from '@ratewarden/shared/rules';
import { createRule } from '@ratewarden/api/features/rules/rules-service';
import { createTransport, sendDueNotices, type SenderSettings } from '@ratewarden/worker/notices/notice-sender';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { startFakeSmtp, type FakeSmtp } from '@ratewarden/worker/smtp-fake/fake-smtp-server';
import { keepInMailbox } from '@ratewarden/worker/smtp-fake/keep-in-mailbox';
import { freePort } from '../support/free-port';
import { provisionUser } from '../support/sign-in';
import { openTestDataSource } from '../support/test-db';
import { noticeCohort } from './notices-fixture';
import { settings, type Cohort, clearCohortData } from './runs-fixture';

/** Threshold notices from the outbox to the SMTP fake: once each, and retried while it is down. */
describe('threshold notices reach the SMTP fake exactly once', () => {
  let ds: DataSource;
  let c: Cohort;
  let port: number;
  let smtp: FakeSmtp | null = null;
  let sender: SenderSettings;
  const startSmtp = async () => {
    smtp = await startFakeSmtp({ port, keep: (m) => keepInMailbox(ds, m) });
  };
  const stopSmtp = async () => {
    await smtp?.close();
    smtp = null;
  };
  const received = async (address: string) =>
    (await ds.query(`SELECT subject, text_body FROM dev_mailbox WHERE $1 = ANY(rcpt_to) ORDER BY id`, [address])) as Array<{
      subject: string;
      text_body: string;
    }>;
  const noticeOf = async (address: string) =>
    (await ds.query(`SELECT state, attempts, last_error, sent_at FROM notices WHERE recipient = $1`, [address])) as Array<Record<string, any>>;

  /** A new rule whose only extra recipient is `address`, then a run: one new flag, one notice to `address`. */
  async function flagWithNoticeTo(address: string): Promise<void> {
    await createRule(
      ds,
      { kind: 'client', clientId: 'notice-tests' },
      watchRuleInputSchema.parse({
        name: `Rate above 1 per 1,000 person-years (${address})`,
        outcomeId: c.outcomes.NOISE,
        exposureGroupId: c.groups.EXP,
        measure: 'rate',
        thresholdOn: 'estimate',
        threshold: 1,
        minCases: 5,
        window: 'month',
        fdrControl: false,
        recipients: [address],
      }),
    );
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(o.status).toBe('succeeded');
    expect(await noticeOf(address)).toMatchObject([{ state: 'pending', attempts: 0 }]);
  }

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician');
    port = await freePort();
    sender = {
      smtpHost: '127.0.0.1',
      smtpPort: port,
      smtpSecure: false,
      from: 'Ratewarden <notices@ratewarden.invalid>',
      retryBaseMs: 200,
      retryMaxMs: 1_000,
      maxAttempts: 50,
      sendingLeaseMs: 60_000,
    };
    // Six exposed cases in one site's month: not small, so a rule may flag them (rules see only shown counts).
    c = await noticeCohort(ds);
    await startSmtp();
  });
  afterAll(async () => {
    await stopSmtp();
    await ds.destroy();
  });

  it('delivers a notice once, even with two senders working the outbox at the same time', async () => {
    const address = `first-${c.tag.toLowerCase()}@kestrelmoor.test`;
    await flagWithNoticeTo(address);
    const other = await openTestDataSource();
    const [t1, t2] = [createTransport(sender), createTransport(sender)];
    try {
      await Promise.all([sendDueNotices(ds, t1, sender), sendDueNotices(other, t2, sender)]);
      await Promise.all([sendDueNotices(ds, t1, sender), sendDueNotices(other, t2, sender)]);
    } finally {
      t1.close();
      t2.close();
      await other.destroy();
    }
    const mails = await received(address);
    expect(mails.length).toBe(1);
    // The e-mail only links to the notice in the inbox; the notice is read there.
    const [notice] = (await ds.query(`SELECT id, subject, body FROM notices WHERE recipient = $1`, [address])) as Array<{
      id: string;
      subject: string;
      body: string;
    }>;
    expect(mails[0]!.subject).toBe('Ratewarden: a new threshold notice for you');
    expect(mails[0]!.text_body).toContain(`/notices/${notice!.id}`);
    expect(mails[0]!.text_body).not.toContain('Group EXP');
    expect(mails[0]!.text_body).not.toContain('Cases in the group');
    expect(notice!.subject).toContain('raised a flag for Group EXP');
    // A flag rests on a shown count (6), so every recipient reads it (compose-notice.test.ts covers a small one) ...
    expect(notice!.body).toContain('Cases in the group: 6');
    // ... and the physician's notice of the same flag.
    const [forPhysician] = (await ds.query(`SELECT body FROM notices WHERE recipient = $1 ORDER BY created_at DESC LIMIT 1`, [
      'physician@demo.ratewarden.test',
    ])) as Array<{ body: string }>;
    expect(forPhysician!.body).toContain('Cases in the group: 6');
    expect(forPhysician!.body).toMatch(/Value: /);
    expect(await noticeOf(address)).toMatchObject([{ state: 'sent', attempts: 1, last_error: null }]);
  });

  it('with the SMTP fake stopped the notice stays pending with its error, and is delivered once it is back', async () => {
    const address = `later-${c.tag.toLowerCase()}@kestrelmoor.test`;
    await stopSmtp();
    await flagWithNoticeTo(address);
    const transport = createTransport(sender);
    try {
      const down = await sendDueNotices(ds, transport, sender);
      expect(down.sent).toBe(0);
      const [pending] = await noticeOf(address);
      expect(pending).toMatchObject({ state: 'pending', attempts: 1, sent_at: null });
      expect(pending!.last_error).toMatch(/ECONNREFUSED|connect/i);
      expect(await received(address)).toEqual([]);

      await startSmtp();
      // Not due before its backoff has passed ...
      expect((await sendDueNotices(ds, transport, sender)).sent).toBe(0);
      await new Promise((r) => setTimeout(r, 250));
      // ... then delivered, once.
      expect((await sendDueNotices(ds, transport, sender)).sent).toBeGreaterThanOrEqual(1);
      await sendDueNotices(ds, transport, sender);
    } finally {
      transport.close();
    }
    expect((await received(address)).length).toBe(1);
    expect(await noticeOf(address)).toMatchObject([{ state: 'sent', attempts: 2 }]);
  });

  it('after the last allowed attempt a notice is marked failed and kept with its error', async () => {
    const address = `never-${c.tag.toLowerCase()}@kestrelmoor.test`;
    await stopSmtp();
    await flagWithNoticeTo(address);
    const transport = createTransport({ ...sender, maxAttempts: 1 });
    try {
      await sendDueNotices(ds, transport, { ...sender, maxAttempts: 1 });
    } finally {
      transport.close();
    }
    const [n] = await noticeOf(address);
    expect(n).toMatchObject({ state: 'failed', attempts: 1 });
    expect(n!.last_error).toBeTruthy();
    await startSmtp();
  });
});
