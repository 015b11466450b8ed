import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { watchRuleSchema } from '@ratewarden/shared/rules';
import { WatchRuleMinCases1764634300000 } from '@ratewarden/db/migrations/1764634300000-WatchRuleMinCases';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';

const WORDS = 'at least 5: smaller counts are withheld from everyone but the physician';

/**
 * A watch rule may not select on a small count: with rules at 1 to 4 cases beside each other,
 * which one raised a flag would tell a reader the count the results withhold.
 */
describe('minimum case counts of watch rules', () => {
  let ds: DataSource;
  let safety: SignedInAgent;
  let outcomeId: number;
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const rule = (extra: object) => ({ name: `Min cases ${tag}`, outcomeId, measure: 'irr', threshold: 1, ...extra });
  const post = (who: SignedInAgent, body: object) => who.agent.post('/api/rules').set('x-csrf-token', who.csrf).send(body);

  beforeAll(async () => {
    ds = await openTestDataSource();
    outcomeId = (
      (await ds.query(`INSERT INTO outcomes (code, name, case_definition, counting_rule) VALUES ($1, 'Min cases outcome', 'test', 'recurrent') RETURNING id`, [
        `MIN${tag}`,
      ])) as Array<{ id: number }>
    )[0]!.id;
    // Company-wide rules: written by someone who reads every site.
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', await allSiteIds(ds));
    safety = await signIn(createApp({ dataSource: ds, config: testApiConfig() }), 'safety@demo.ratewarden.test');
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it.each([0, 1, 2, 3, 4])('refuses %i cases with 422 and the reason in words', async (minCases) => {
    const res = await post(safety, rule({ minCases })).expect(422);
    expect(res.body.details).toEqual([{ path: 'minCases', message: WORDS }]);
  });

  it('stores 5, and makes 5 the default', async () => {
    const five = watchRuleSchema.parse((await post(safety, rule({ minCases: 5 })).expect(201)).body);
    expect(five.minCases).toBe(5);
    const unsaid = watchRuleSchema.parse((await post(safety, rule({ name: `Default ${tag}` })).expect(201)).body);
    expect(unsaid.minCases).toBe(5);
  });

  it('refuses a change down to 4 and leaves the rule as it was', async () => {
    const created = watchRuleSchema.parse((await post(safety, rule({ name: `Lower ${tag}`, minCases: 6 })).expect(201)).body);
    const res = await safety.agent.patch(`/api/rules/${created.id}`).set('x-csrf-token', safety.csrf).send({ minCases: 4 }).expect(422);
    expect(res.body.details).toEqual([{ path: 'minCases', message: WORDS }]);
    expect((await safety.agent.get(`/api/rules/${created.id}`).expect(200)).body.minCases).toBe(6);
  });

  it('follows the configured SMALL_CELL_THRESHOLD', async () => {
    const strict = await signIn(createApp({ dataSource: ds, config: testApiConfig({ SMALL_CELL_THRESHOLD: '8' }) }), 'safety@demo.ratewarden.test');
    const refused = await post(strict, rule({ name: `Strict ${tag}`, minCases: 7 })).expect(422);
    expect(refused.body.details).toEqual([{ path: 'minCases', message: 'at least 8: smaller counts are withheld from everyone but the physician' }]);
    expect((await post(strict, rule({ name: `Strict ${tag}` })).expect(201)).body.minCases).toBe(8);
  });

  it('the migration raises stored rules below 5 to 5 and audits each', async () => {
    const runner = ds.createQueryRunner();
    await runner.startTransaction();
    try {
      const [old] = (await runner.query(
        `INSERT INTO watch_rules (name, outcome_id, measure, threshold_on, threshold, min_cases, window_kind) VALUES ($1, $2, 'irr', 'lower_bound', 1, 2, 'rolling12') RETURNING id`,
        [`Old ${tag}`, outcomeId],
      )) as Array<{ id: string }>;
      const [kept] = (await runner.query(
        `INSERT INTO watch_rules (name, outcome_id, measure, threshold_on, threshold, min_cases, window_kind) VALUES ($1, $2, 'irr', 'lower_bound', 1, 9, 'rolling12') RETURNING id`,
        [`Kept ${tag}`, outcomeId],
      )) as Array<{ id: string }>;
      await new WatchRuleMinCases1764634300000().up(runner);
      const stored = (await runner.query(`SELECT id, min_cases FROM watch_rules WHERE id = ANY($1)`, [[old!.id, kept!.id]])) as Array<{
        id: string;
        min_cases: number;
      }>;
      expect(Object.fromEntries(stored.map((r) => [r.id, r.min_cases]))).toEqual({ [old!.id]: 5, [kept!.id]: 9 });
      const audits = (await runner.query(`SELECT actor_label, action, target, detail FROM audit_events WHERE target = ANY($1)`, [
        [`watch_rule:${old!.id}`, `watch_rule:${kept!.id}`],
      ])) as unknown[];
      expect(audits).toEqual([
        {
          actor_label: 'migration',
          action: 'rule.update',
          target: `watch_rule:${old!.id}`,
          detail: expect.objectContaining({ before: { minCases: 2 }, after: { minCases: 5 } }),
        },
      ]);
      const columns = (await runner.query(
        `SELECT column_default FROM information_schema.columns WHERE table_name = 'watch_rules' AND column_name = 'min_cases'`,
      )) as Array<{ column_default: string }>;
      expect(columns).toEqual([{ column_default: '5' }]);
    } finally {
      await runner.rollbackTransaction();
      await runner.release();
    }
  });
});
