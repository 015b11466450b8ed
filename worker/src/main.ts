import { createDataSource } from '@ratewarden/db';
import { exitWithParent } from '@ratewarden/shared/runtime/exit-with-parent';
import { readWorkerConfig } from './config';
import { startLoop } from './loop';
import { createTransport, sendDueNotices, type SenderSettings } from './notices/notice-sender';
import { describeOutcome } from './runs/describe-outcome';
import { nightlyRun } from './runs/nightly-run';
import { runIfRequested } from './runs/request-poller';
import { currentAnalysisSettings } from './runs/analysis-settings';
import { runSettingsOf } from './runs/run-settings';
import { startSchedule } from './schedule';

const config = readWorkerConfig();
// Two pooled connections for the loops plus the run's dedicated one (it holds the advisory lock).
const dataSource = createDataSource(undefined, 3);
await dataSource.initialize();
console.log('connected to the database');
const settings = runSettingsOf(config);
// A new database takes the environment's analysis settings as version 1; later runs use the current version.
const seeded = await currentAnalysisSettings(dataSource, settings);
console.log(`analysis settings: version ${seeded.version}`);

const task = startSchedule(config, async () => {
  console.log(describeOutcome(await nightlyRun(dataSource, config, settings)));
});
console.log(
  `nightly schedule "${config.RUN_SCHEDULE}" in time zone ${config.RUN_TIMEZONE}; requested runs after ${config.RUN_QUIET_SECONDS} s without a new request`,
);

const requests = startLoop('run request check', config.RUN_POLL_MS, async () => {
  // A long-lived worker keeps its statistics threads warm between runs; process.exit ends them.
  const outcome = await runIfRequested(dataSource, settings, config.APP_BASE_URL, {
    keepComputeThreads: true,
    smallCellThreshold: config.SMALL_CELL_THRESHOLD,
    rulesOnPartialPeriods: config.RULES_ON_PARTIAL_PERIODS,
    quietSeconds: config.RUN_QUIET_SECONDS,
  });
  if (outcome) console.log(describeOutcome(outcome));
});

const sender: SenderSettings = {
  smtpHost: config.SMTP_HOST,
  smtpPort: config.SMTP_PORT,
  smtpSecure: config.SMTP_SECURE,
  smtpUser: config.SMTP_USER,
  smtpPass: config.SMTP_PASS,
  from: config.NOTICE_FROM,
  retryBaseMs: config.NOTICE_RETRY_BASE_MS,
  retryMaxMs: config.NOTICE_RETRY_MAX_MS,
  maxAttempts: config.NOTICE_MAX_ATTEMPTS,
  sendingLeaseMs: config.NOTICE_SENDING_LEASE_MS,
};
const transport = createTransport(sender);
const notices = startLoop('notice sender', config.NOTICE_POLL_MS, async () => {
  const { sent, failed } = await sendDueNotices(dataSource, transport, sender);
  if (sent || failed) console.log(`threshold notices: ${sent} sent, ${failed} attempts failed`);
});
console.log(`threshold notices go to ${config.SMTP_HOST}:${config.SMTP_PORT}`);

let closing = false;
async function shutdown(): Promise<void> {
  if (closing) return;
  closing = true;
  await task.stop();
  await Promise.all([requests.stop(), notices.stop()]);
  transport.close();
  await dataSource.destroy().catch(() => {});
  console.log('worker stopped');
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown());
process.on('SIGINT', () => void shutdown());
exitWithParent(() => void shutdown());
