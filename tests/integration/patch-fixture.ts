import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds } from '../support/test-db';

export interface WriteFixture {
  tag: string;
  siteIds: number[];
  personId: string;
  groupId: number;
  outcomeId: number;
  ruleId: string;
  as: Record<'admin' | 'hygienist' | 'safety', SignedInAgent>;
  /** A write with the signed-in person's CSRF token. */
  write: (who: SignedInAgent, method: 'post' | 'patch' | 'put', path: string, body: object) => ReturnType<SignedInAgent['agent']['post']>;
  /** How many audit events name `target`. */
  audits: (target: string) => Promise<number>;
}

/** Something of every kind the write routes change (a person, an exposure group, an outcome, a watch rule), and who may change it. */
export async function writeFixture(ds: DataSource): Promise<WriteFixture> {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const siteIds = (
    (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Patch site A'), ($2, 'Patch site B') RETURNING id`, [`PA${tag}`, `PB${tag}`])) as Array<{
      id: number;
    }>
  ).map((s) => s.id);
  const personId = await provisionUser(ds, `patch-${tag.toLowerCase()}@kestrelmoor.test`, 'hygienist', siteIds);
  await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
  await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist');
  // A company-wide watch rule is written by someone who reads every site.
  await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', await allSiteIds(ds));
  const app = createApp({ dataSource: ds, config: testApiConfig() });
  const as = {
    admin: await signIn(app, 'admin@demo.ratewarden.test'),
    hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
    safety: await signIn(app, 'safety@demo.ratewarden.test'),
  };
  const write: WriteFixture['write'] = (who, method, path, body) => who.agent[method](path).set('x-csrf-token', who.csrf).send(body);
  const group = await write(as.hygienist, 'post', '/api/groups', {
    code: `PG${tag}`,
    name: 'Patch group',
    hazard: 'noise',
    exposureLevel: 2,
    description: 'kept',
  }).expect(201);
  const outcome = await write(as.hygienist, 'post', '/api/outcomes', {
    code: `PO${tag}`,
    name: 'Patch outcome',
    caseDefinition: 'test',
    countingRule: 'recurrent',
    lagMonths: 6,
  }).expect(201);
  const rule = await write(as.safety, 'post', '/api/rules', {
    name: `Patch rule ${tag}`,
    outcomeId: outcome.body.id,
    exposureGroupId: group.body.id,
    measure: 'irr',
    threshold: 1.5,
    recipients: ['watch@kestrelmoor.test'],
  }).expect(201);
  const audits = async (target: string) =>
    ((await ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE target = $1`, [target])) as Array<{ n: number }>)[0]!.n;
  return { tag, siteIds, personId, groupId: group.body.id, outcomeId: outcome.body.id, ruleId: rule.body.id, as, write, audits };
}
