import type { DataSource } from 'typeorm';
import { watchRuleInputSchema } from '@ratewarden/shared/rules';
import { createRule } from '@ratewarden/api/features/rules/rules-service';
import type { SenderSettings } from '@ratewarden/worker/notices/notice-sender';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * Threshold notices for the sender's tests, made the product's way: a cohort whose exposed
 * group has six cases in March 2031, then for each call a new watch rule (rate above 1 per
 * 1,000 person-years) with the given recipients and a run, which raises one flag and writes one
 * notice per recipient (and per physician) into the outbox. Run tests empty the cohort first.
 */
export async function noticeCohort(ds: DataSource): Promise<Cohort> {
  const c = await makeCohort(ds, {
    groups: [
      ['REF', 0],
      ['EXP', 1],
    ],
    reference: 'REF',
    outcomes: [['NOISE', 'recurrent']],
  });
  const exposed: number[] = [];
  for (let i = 0; i < 6; i++) {
    const e = await c.worker(`e${i}`, 1980, 'M');
    const r = await c.worker(`r${i}`, 1980, 'F');
    exposed.push(e);
    await c.roster([
      [e, '2031-03-01', c.sites[0]!, c.groups.EXP!, 150],
      [r, '2031-03-01', c.sites[0]!, c.groups.REF!, 150],
    ]);
  }
  await c.cases(exposed.map((w) => [w, c.outcomes.NOISE!, '2031-03-04'] as [number, number, string]));
  return c;
}

/** A new watch rule for `recipients` and a run; returns the ids of the notices written for them. */
export async function raiseNotices(ds: DataSource, c: Cohort, name: string, recipients: string[]): Promise<string[]> {
  await createRule(
    ds,
    { kind: 'client', clientId: 'notice-tests' },
    watchRuleInputSchema.parse({
      name,
      outcomeId: c.outcomes.NOISE,
      exposureGroupId: c.groups.EXP,
      measure: 'rate',
      thresholdOn: 'estimate',
      threshold: 1,
      minCases: 5,
      window: 'month',
      fdrControl: false,
      recipients,
    }),
  );
  const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
  if (o.status !== 'succeeded') throw new Error(`the run that should raise notices ended ${o.status}`);
  const ids = (await ds.query(`SELECT id FROM notices WHERE recipient = ANY($1) AND state = 'pending' ORDER BY recipient`, [
    recipients.map((r) => r.toLowerCase()),
  ])) as Array<{ id: string }>;
  if (ids.length !== recipients.length) throw new Error(`expected ${recipients.length} new notices, found ${ids.length}`);
  return ids.map((r) => r.id);
}

/** Sender settings for tests: the fake on `port`, quick retries, a lease of `sendingLeaseMs`. */
export function testSender(port: number, overrides: Partial<SenderSettings> = {}): SenderSettings {
  return {
    smtpHost: '127.0.0.1',
    smtpPort: port,
    smtpSecure: false,
    from: 'Ratewarden <notices@ratewarden.invalid>',
    retryBaseMs: 200,
    retryMaxMs: 1_000,
    maxAttempts: 50,
    sendingLeaseMs: 60_000,
    ...overrides,
  };
}
