import { createDataSource } from '@ratewarden/db';
import { exitWithParent } from '@ratewarden/shared/runtime/exit-with-parent';
import { readWorkerConfig } from './config';
import { startSchedule } from './schedule';

const config = readWorkerConfig();
const dataSource = createDataSource(undefined, 2);
await dataSource.initialize();
console.log('connected to the database');

const task = startSchedule(config, async () => {
  const started = new Date();
  await dataSource.query('SELECT 1');
  console.log(`scheduled tick at ${started.toISOString()}`);
});
console.log(`nightly schedule "${config.RUN_SCHEDULE}" in time zone ${config.RUN_TIMEZONE}`);

let closing = false;
async function shutdown(): Promise<void> {
  if (closing) return;
  closing = true;
  await task.stop();
  await dataSource.destroy().catch(() => {});
  console.log('worker stopped');
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown());
process.on('SIGINT', () => void shutdown());
exitWithParent(() => void shutdown());
