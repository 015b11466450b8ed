import { createDataSource, readDbConfig } from '@ratewarden/db';
import { readWorkerConfig } from '@ratewarden/worker/config';
import { describeOutcome } from '@ratewarden/worker/runs/describe-outcome';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { runSettingsOf } from '@ratewarden/worker/runs/run-settings';
import { runMain, say, SetupError } from './lib/log';

/**
 * `npm run run-now`: one run, now, against the database of `npm start` (or DATABASE_URL). When a
 * run is in progress elsewhere it waits for it to finish (up to 30 minutes) and then runs.
 */
runMain(async () => {
  const { DATABASE_URL } = readDbConfig();
  const config = readWorkerConfig();
  const ds = createDataSource(DATABASE_URL, 2);
  try {
    await ds.initialize();
  } catch (err) {
    throw new SetupError(
      `cannot reach the database at ${DATABASE_URL.replace(/\/\/[^@]*@/, '//')} (is \`npm start\` running?): ${err instanceof Error ? err.message : String(err)}`,
    );
  }
  try {
    say('running ...');
    const outcome = await performRun(ds, {
      trigger: 'cli',
      reason: 'npm run run-now',
      settings: runSettingsOf(config),
      appUrl: config.APP_BASE_URL,
      waitForLockMs: 30 * 60_000,
      smallCellThreshold: config.SMALL_CELL_THRESHOLD,
      rulesOnPartialPeriods: config.RULES_ON_PARTIAL_PERIODS,
    });
    say(describeOutcome(outcome));
    return outcome.status === 'succeeded' ? 0 : 1;
  } finally {
    await ds.destroy();
  }
});
