// Child process of kill-notice-sender.test.ts: the notice sender, which kills itself (kill -9)
// as soon as the SMTP server has acknowledged its first notice, before the outbox records it as
// sent. Arguments: the SMTP port and the sending lease in milliseconds; DATABASE_URL is the test database.
import { createDataSource } from '@ratewarden/db';
import { createTransport, sendDueNotices, type NoticeTransport, type SenderSettings } from '@ratewarden/worker/notices/notice-sender';

const [port, leaseMs] = process.argv.slice(2).map(Number) as [number, number];
const ds = createDataSource(undefined, 2);
await ds.initialize();
const settings: SenderSettings = {
  smtpHost: '127.0.0.1',
  smtpPort: port,
  smtpSecure: false,
  from: 'Ratewarden <notices@ratewarden.invalid>',
  retryBaseMs: 100,
  retryMaxMs: 500,
  maxAttempts: 50,
  sendingLeaseMs: leaseMs,
};
const real = createTransport(settings);
const dying: NoticeTransport = {
  sendMail: (async (mail: Parameters<NoticeTransport['sendMail']>[0]) => {
    await real.sendMail(mail);
    process.kill(process.pid, 'SIGKILL');
  }) as NoticeTransport['sendMail'],
};
await sendDueNotices(ds, dying, settings);
process.stdout.write('nothing was due\n');
process.exit(0);
