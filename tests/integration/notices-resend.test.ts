import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { claimNextNotice } from '@ratewarden/worker/notices/claim-notice';
import { createTransport, sendDueNotices, type NoticeTransport } from '@ratewarden/worker/notices/notice-sender';
import { startFakeSmtp, type FakeSmtp } from '@ratewarden/worker/smtp-fake/fake-smtp-server';
import { keepInMailbox } from '@ratewarden/worker/smtp-fake/keep-in-mailbox';
import { freePort } from '../support/free-port';
import { provisionUser } from '../support/sign-in';
import { openTestDataSource } from '../support/test-db';
import { noticeCohort, raiseNotices, testSender } from './notices-fixture';
import { clearCohortData, type Cohort } from './runs-fixture';

/**
 * A notice whose delivery was interrupted between the SMTP conversation and the outbox's record
 * of it is sent again with the same Message-ID, and the mailbox keeps one copy.
 */
describe('threshold notices resent after an interruption reach the recipient once', () => {
  let ds: DataSource;
  let c: Cohort;
  let smtp: FakeSmtp;
  let port: number;
  const mailbox = async (address: string) =>
    (await ds.query(`SELECT message_id, subject FROM dev_mailbox WHERE $1 = ANY(rcpt_to) ORDER BY id`, [address])) as Array<{
      message_id: string;
      subject: string;
    }>;
  const notice = async (id: string) =>
    (
      (await ds.query(`SELECT state, attempts, message_id, server_response, last_error, last_attempt_at, sent_at FROM notices WHERE id = $1`, [id])) as Array<
        Record<string, any>
      >
    )[0]!;
  const address = (what: string) => `${what}-${c.tag.toLowerCase()}@kestrelmoor.test`;
  // Only the notices a test made: the physician's copies of each flag stay in the outbox, unsent.
  const onlyFor = async (ids: string[]) =>
    ds.query(`UPDATE notices SET next_attempt_at = now() + interval '1 day' WHERE state = 'pending' AND id <> ALL($1::uuid[])`, [ids]);

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician');
    c = await noticeCohort(ds);
    port = await freePort();
    smtp = await startFakeSmtp({ port, keep: (m) => keepInMailbox(ds, m) });
  });
  afterAll(async () => {
    await smtp.close();
    await ds.destroy();
  });

  it("records the attempt before sending and the server's reply after, under a Message-ID fixed by the notice", async () => {
    const to = address('plain');
    const [id] = await raiseNotices(ds, c, `plain ${c.tag}`, [to]);
    await onlyFor([id!]);
    let seenWhileSending: Record<string, any> | undefined;
    const real = createTransport(testSender(port));
    const watching: NoticeTransport = {
      sendMail: (async (m: Parameters<NoticeTransport['sendMail']>[0]) => {
        seenWhileSending = await notice(id!);
        return real.sendMail(m);
      }) as NoticeTransport['sendMail'],
    };
    try {
      expect(await sendDueNotices(ds, watching, testSender(port))).toEqual({ sent: 1, failed: 0 });
    } finally {
      real.close();
    }
    expect(seenWhileSending).toMatchObject({ state: 'sending', attempts: 1, message_id: `<notice-${id}@ratewarden.local>`, sent_at: null });
    expect(seenWhileSending!.last_attempt_at).toBeInstanceOf(Date);
    const sent = await notice(id!);
    expect(sent).toMatchObject({ state: 'sent', attempts: 1, last_error: null, message_id: `<notice-${id}@ratewarden.local>` });
    expect(sent.server_response).toMatch(/^250/);
    expect(await mailbox(to)).toEqual([{ message_id: `<notice-${id}@ratewarden.local>`, subject: 'Ratewarden: a new threshold notice for you' }]);
  });

  it('a send whose acknowledgement was lost (the sender throws after the server kept the mail) is retried once, and the mailbox keeps one copy', async () => {
    const to = address('lost-ack');
    const [id] = await raiseNotices(ds, c, `lost ack ${c.tag}`, [to]);
    await onlyFor([id!]);
    const real = createTransport(testSender(port));
    let calls = 0;
    const losing: NoticeTransport = {
      sendMail: (async (m: Parameters<NoticeTransport['sendMail']>[0]) => {
        calls++;
        const info = await real.sendMail(m);
        if (calls === 1) throw new Error('connection closed before the reply was read');
        return info;
      }) as NoticeTransport['sendMail'],
    };
    const sender = testSender(port, { retryBaseMs: 50 });
    try {
      expect(await sendDueNotices(ds, losing, sender)).toEqual({ sent: 0, failed: 1 });
      expect(await notice(id!)).toMatchObject({ state: 'pending', attempts: 1, last_error: 'connection closed before the reply was read' });
      expect(await mailbox(to)).toHaveLength(1);
      await new Promise((r) => setTimeout(r, 100));
      expect(await sendDueNotices(ds, losing, sender)).toEqual({ sent: 1, failed: 0 });
    } finally {
      real.close();
    }
    expect(calls).toBe(2);
    expect(await notice(id!)).toMatchObject({ state: 'sent', attempts: 2, last_error: null });
    expect(await mailbox(to)).toEqual([{ message_id: `<notice-${id}@ratewarden.local>`, subject: expect.any(String) }]);
  });

  it('a notice left sending by a sender that stopped between the send and its record is taken over after the lease and kept once', async () => {
    const to = address('orphan');
    const [id] = await raiseNotices(ds, c, `orphan ${c.tag}`, [to]);
    await onlyFor([id!]);
    const sender = testSender(port, { sendingLeaseMs: 300 });
    const transport = createTransport(sender);
    try {
      // The first sender claims the notice, the mail goes out, and the sender stops before recording it.
      const claim = await claimNextNotice(ds, sender);
      expect(claim).toMatchObject({ kind: 'claimed', notice: { id, attempts: 1, messageId: `<notice-${id}@ratewarden.local>` } });
      if (claim.kind !== 'claimed') return;
      await transport.sendMail({
        from: sender.from,
        to: claim.notice.recipient,
        subject: claim.notice.subject,
        text: claim.notice.body,
        messageId: claim.notice.messageId,
      });
      expect(await notice(id!)).toMatchObject({ state: 'sending', attempts: 1 });
      // Within the lease another sender leaves it alone ...
      expect(await sendDueNotices(ds, transport, sender)).toEqual({ sent: 0, failed: 0 });
      await new Promise((r) => setTimeout(r, 400));
      // ... after it, sends it again under the same Message-ID.
      expect(await sendDueNotices(ds, transport, sender)).toEqual({ sent: 1, failed: 0 });
    } finally {
      transport.close();
    }
    expect(await notice(id!)).toMatchObject({ state: 'sent', attempts: 2 });
    expect(await mailbox(to)).toHaveLength(1);
  });

  it('a notice whose sender stopped during its last allowed attempt is marked failed, delivery unknown', async () => {
    const to = address('last-try');
    const [id] = await raiseNotices(ds, c, `last try ${c.tag}`, [to]);
    await onlyFor([id!]);
    const sender = testSender(port, { sendingLeaseMs: 50, maxAttempts: 1 });
    expect(await claimNextNotice(ds, sender)).toMatchObject({ kind: 'claimed' });
    await new Promise((r) => setTimeout(r, 100));
    const transport = createTransport(sender);
    try {
      expect(await sendDueNotices(ds, transport, sender)).toEqual({ sent: 0, failed: 1 });
    } finally {
      transport.close();
    }
    expect(await notice(id!)).toMatchObject({ state: 'failed', attempts: 1, last_error: expect.stringMatching(/delivery unknown/) });
    expect(await mailbox(to)).toEqual([]);
  });

  it('the mailbox keeps one message per Message-ID and recipients, however often it arrives', async () => {
    const raw = (messageId: string) => `Message-ID: ${messageId}\r\nSubject: twice\r\nContent-Type: text/plain\r\n\r\nsame body\r\n`;
    const to = [address('twice')];
    expect(await keepInMailbox(ds, { from: 'a@x.test', to, raw: raw('<same@x.test>') })).toBe(true);
    expect(await keepInMailbox(ds, { from: 'a@x.test', to, raw: raw('<same@x.test>') })).toBe(false);
    expect(await keepInMailbox(ds, { from: 'a@x.test', to: [address('other')], raw: raw('<same@x.test>') })).toBe(true);
    expect(await keepInMailbox(ds, { from: 'a@x.test', to, raw: raw('<another@x.test>') })).toBe(true);
    expect(await mailbox(to[0]!)).toEqual([
      { message_id: '<same@x.test>', subject: 'twice' },
      { message_id: '<another@x.test>', subject: 'twice' },
    ]);
  });
});
