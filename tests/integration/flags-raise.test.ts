import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import { watchRuleInputSchema } from '@ratewarden/shared/rules';
import { closeFlag, flagCases, getFlag, startReview } from '@ratewarden/api/features/flags/flags-service';
import { createRule } from '@ratewarden/api/features/rules/rules-service';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { makeCohort, settings, type Cohort, clearCohortData } from './runs-fixture';

/**
 * Watch rules raising flags. EXP has 24 cases in 1.6 person-years against REF's 5 in 1.6
 * (IRR 4.8, exact lower 95% bound well above 1); MID has 5 in 1.6 (IRR 1). Rules look only at
 * counts every reader of flags may see, so the reference count is not small.
 */
describe('watch rules raise, update, escalate and re-raise flags', () => {
  let ds: DataSource;
  let c: Cohort;
  let ruleId: string;
  let physician: Principal;
  let safety: Principal;
  const ids: Record<string, number[]> = { REF: [], MID: [], EXP: [] };
  const recipient = `safety-lead-${Date.now()}@kestrelmoor.test`;
  const run = async () => {
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(o.status).toBe('succeeded');
    return (o as { runId: string }).runId;
  };
  const flagsOfRule = async () =>
    (await ds.query(`SELECT id, exposure_group_id, state, value, worst_value FROM flags WHERE rule_id = $1 ORDER BY raised_at`, [ruleId])) as Array<
      Record<string, any>
    >;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['MID', 1],
        ['EXP', 2],
      ],
      reference: 'REF',
      outcomes: [['DERM', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    for (const g of ['REF', 'MID', 'EXP'] as const) {
      for (let i = 0; i < 10; i++) {
        const w = await c.worker(`${g}${i}`, 1970 + i * 3, i % 2 ? 'F' : 'M');
        ids[g]!.push(w);
        for (const m of ['2031-11-01', '2031-12-01']) rows.push([w, m, c.sites[i % 2]!, c.groups[g]!, 160]);
      }
    }
    await c.roster(rows);
    await c.cases([
      ...ids
        .EXP!.slice(0, 6)
        .flatMap((w) => ['2031-11-10', '2031-11-12', '2031-12-10', '2031-12-12'].map((d) => [w, c.outcomes.DERM!, d] as [number, number, string])),
      ...ids.REF!.slice(0, 5).map((w) => [w, c.outcomes.DERM!, '2031-12-03'] as [number, number, string]),
      ...ids.MID!.slice(0, 5).map((w) => [w, c.outcomes.DERM!, '2031-12-03'] as [number, number, string]),
    ]);
    const [p] = (await ds.query(`INSERT INTO users (subject, email, name, role) VALUES ($1, $2, 'Test physician', 'physician') RETURNING id, email`, [
      `phys-${c.tag}`,
      `phys-${c.tag.toLowerCase()}@kestrelmoor.test`,
    ])) as Array<{ id: string; email: string }>;
    // A company-wide rule and its flag are for people who read every site (other files' sites exist too).
    const allSites = await allSiteIds(ds);
    physician = { kind: 'user', id: p!.id, email: p!.email, name: 'Test physician', role: 'physician', siteIds: allSites };
    const [s] = (await ds.query(`INSERT INTO users (subject, email, name, role) VALUES ($1, $2, 'Test safety', 'safety_manager') RETURNING id, email`, [
      `safe-${c.tag}`,
      `safe-${c.tag.toLowerCase()}@kestrelmoor.test`,
    ])) as Array<{ id: string; email: string }>;
    safety = { kind: 'user', id: s!.id, email: s!.email, name: 'Test safety', role: 'safety_manager', siteIds: allSites };
    const rule = await createRule(
      ds,
      safety,
      watchRuleInputSchema.parse({
        name: 'IRR lower bound above 1',
        outcomeId: c.outcomes.DERM,
        measure: 'irr',
        thresholdOn: 'lower_bound',
        threshold: 1,
        minCases: 5,
        window: 'rolling12',
        recipients: [recipient],
      }),
    );
    ruleId = rule.id;
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('raises one flag for the group past the rule, none for the group at the reference rate', async () => {
    const runId = await run();
    const flags = await flagsOfRule();
    expect(flags.map((f) => [f.exposure_group_id, f.state])).toEqual([[c.groups.EXP, 'raised']]);
    const detail = await getFlag(ds, flags[0]!.id);
    expect(detail.figures).toMatchObject({ runId, cases: 24, period: '2031-12-01', window: 'rolling12', measure: 'irr' });
    expect(detail.figures.value).toBeGreaterThan(1);
    expect(detail.figures.q).not.toBeNull(); // Benjamini–Hochberg is on by default
    expect(detail.events.map((e) => e.kind)).toEqual(['raised']);
    expect(detail.notices.map((n) => n.recipient).sort()).toEqual(expect.arrayContaining([physician.kind === 'user' ? physician.email : '', recipient]));
    const audits = (await ds.query(`SELECT action FROM audit_events WHERE target = $1`, [`flag:${flags[0]!.id}`])) as Array<{ action: string }>;
    expect(audits.map((a) => a.action)).toContain('flag.raise');
  });

  it('a notice names the rule and the group with aggregate numbers only: no outcome, worker or case detail', async () => {
    const [flag] = await flagsOfRule();
    const notices = (await ds.query(`SELECT subject, body FROM notices WHERE flag_id = $1`, [flag!.id])) as Array<{ subject: string; body: string }>;
    const text = notices.map((n) => `${n.subject}\n${n.body}`).join('\n');
    expect(text).toContain('IRR lower bound above 1');
    expect(text).toContain('Group EXP');
    expect(text).toContain('Cases in the group: 24');
    expect(text).toContain(`/flags/${flag!.id}`);
    expect(text).not.toContain('Outcome DERM');
    expect(text).not.toContain(`${c.tag}-`); // every worker key and case reference starts with it
  });

  it('the next run with the same data leaves the one open flag alone: no duplicate, no new notice', async () => {
    const before = (
      (await ds.query(`SELECT count(*)::int AS n FROM notices n JOIN flags f ON f.id = n.flag_id WHERE f.rule_id = $1`, [ruleId])) as Array<{ n: number }>
    )[0]!.n;
    await run();
    expect((await flagsOfRule()).length).toBe(1);
    const after = (
      (await ds.query(`SELECT count(*)::int AS n FROM notices n JOIN flags f ON f.id = n.flag_id WHERE f.rule_id = $1`, [ruleId])) as Array<{ n: number }>
    )[0]!.n;
    expect(after).toBe(before);
  });

  it('more cases escalate the open flag and write new notices', async () => {
    const [flag] = await flagsOfRule();
    await c.cases(ids.EXP!.slice(6, 10).map((w) => [w, c.outcomes.DERM!, '2031-12-20'] as [number, number, string]));
    await run();
    const flags = await flagsOfRule();
    expect(flags.length).toBe(1);
    expect(flags[0]!.worst_value).toBeGreaterThan(flag!.worst_value);
    const detail = await getFlag(ds, flag!.id);
    expect(detail.events.map((e) => e.kind)).toEqual(['raised', 'escalated']);
    expect(detail.notices.filter((n) => n.recipient === recipient).length).toBe(2);
  });

  it('the physician sees the cases behind the flag, and the read is audited', async () => {
    const [flag] = await flagsOfRule();
    const cases = await flagCases(ds, physician, flag!.id);
    expect(cases.length).toBe(28);
    expect(cases.every((x) => x.workerKey.startsWith(`${c.tag}-EXP`))).toBe(true);
    const audits = (await ds.query(`SELECT action, actor_id FROM audit_events WHERE target = $1 AND action = 'cases.read'`, [`flag:${flag!.id}`])) as Array<{
      actor_id: string;
    }>;
    expect(audits.map((a) => a.actor_id)).toEqual([physician.kind === 'user' ? physician.id : '']);
  });

  it('review then close; the closed flag is not raised again unless the measure worsens past it', async () => {
    const [flag] = await flagsOfRule();
    await expect(
      closeFlag(ds, safety, flag!.id, { reason: 'explained', comment: 'x' }).then(() => startReview(ds, safety, flag!.id, undefined)),
    ).rejects.toThrow(/closed/);
    const closed = await getFlag(ds, flag!.id);
    expect(closed.state).toBe('closed');
    expect(closed.closeReason).toBe('explained');

    await run();
    expect((await flagsOfRule()).length).toBe(1); // same numbers: stays closed, nothing new

    // Worse: four more exposed cases.
    await c.cases(ids.EXP!.slice(0, 4).map((w) => [w, c.outcomes.DERM!, '2031-12-25'] as [number, number, string]));
    await run();
    const flags = await flagsOfRule();
    expect(flags.map((f) => f.state)).toEqual(['closed', 'raised']);
    expect(flags[1]!.value).toBeGreaterThan(flags[0]!.worst_value);
    const events = (await getFlag(ds, flag!.id)).events.map((e) => e.kind);
    expect(events).toEqual(['raised', 'escalated', 'closed']);
  });

  it('review moves raised to in review; a second review is refused', async () => {
    const open = (await flagsOfRule()).find((f) => f.state === 'raised')!;
    const reviewed = await startReview(ds, safety, open.id, 'looking into it');
    expect(reviewed.state).toBe('in_review');
    await expect(startReview(ds, safety, open.id, undefined)).rejects.toThrow(/in review/);
    const audits = (await ds.query(`SELECT action FROM audit_events WHERE target = $1 ORDER BY id`, [`flag:${open.id}`])) as Array<{ action: string }>;
    expect(audits.map((a) => a.action)).toEqual(['flag.raise', 'flag.review']);
  });
});
