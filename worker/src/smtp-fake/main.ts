import { createDataSource } from '@ratewarden/db';
import { exitWithParent } from '@ratewarden/shared/runtime/exit-with-parent';
import { z } from 'zod';
import { startFakeSmtp } from './fake-smtp-server';
import { keepInMailbox } from './keep-in-mailbox';

/** The development SMTP fake as its own process (started by `npm start`): every message goes to `dev_mailbox`. */
const config = z
  .object({
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525).describe('port of the fake on 127.0.0.1'),
    NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  })
  .parse(process.env);
if (config.NODE_ENV === 'production') {
  console.error('the SMTP fake is for development and tests only; configure a real SMTP server in production');
  process.exit(1);
}

const dataSource = createDataSource(undefined, 2);
await dataSource.initialize();
const smtp = await startFakeSmtp({ port: config.SMTP_PORT, keep: (m) => keepInMailbox(dataSource, m) });
console.log(`development SMTP fake listening on 127.0.0.1:${smtp.port}; messages are kept in the mailbox page`);

let closing = false;
async function shutdown(): Promise<void> {
  if (closing) return;
  closing = true;
  await smtp.close();
  await dataSource.destroy().catch(() => {});
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown());
process.on('SIGINT', () => void shutdown());
exitWithParent(() => void shutdown());
