import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';
import { makeCohort, settings, type Cohort } from '../integration/runs-fixture';

/**
 * The physician finds the live run's unattributed cases from the run page and reads each with its
 * reason; the hygienist sees that there are some, without the cases. Data by SQL: five workers and
 * R in January and February 2033; a correction of January drops R, whose SKIN case of January
 * loses its row; N joins in February with a LUNG case (one-month lag) that looks at January.
 */
describe('the physician sees the cases no roster row attributes', () => {
  let c: Cohort;
  const refs = { removed: '', noRoster: '' };
  const intakes = { roster: '', cases: '' };

  const h = useBrowserApp(async (ds) => {
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [
        ['SKIN', 'recurrent'],
        ['LUNG', 'recurrent', 1],
      ],
    });
    const site = c.sites[0]!;
    const steady = [];
    for (let i = 0; i < 5; i++) steady.push(await c.worker(`W${i}`, 1980 + i, i % 2 ? 'F' : 'M'));
    const r = await c.worker('R', 1975, 'M');
    const n = await c.worker('N', 1995, 'F');
    await c.roster([
      ...[...steady, r].flatMap((w, i) =>
        ['2033-01-01', '2033-02-01'].map((m) => [w, m, site, i % 2 ? c.groups.EXP! : c.groups.REF!, 160] as [number, string, number, number, number]),
      ),
      [n, '2033-02-01', site, c.groups.EXP!, 160],
    ]);
    await c.cases([
      [r, c.outcomes.SKIN!, '2033-01-15'],
      [n, c.outcomes.LUNG!, '2033-02-10'],
    ]);
    refs.removed = `${c.tag}-C1`;
    refs.noRoster = `${c.tag}-C2`;
    // The correction of January: a new version of the slice without R.
    const [fix] = (await ds.query(
      `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at)
       VALUES ('roster', 'applied', 'january-corrected.csv', $1, 1, $2, 'browser-test', now()) RETURNING id`,
      [randomBytes(32).toString('hex'), [site]],
    )) as Array<{ id: string }>;
    await ds.query(
      `INSERT INTO roster_entries (intake_id, worker_id, month, site_id, exposure_group_id, hours)
       SELECT $1, worker_id, month, site_id, exposure_group_id, hours FROM roster_entries WHERE intake_id = $2 AND month = '2033-01-01' AND site_id = $3 AND worker_id <> $4`,
      [fix!.id, c.rosterIntake, site, r],
    );
    await ds.query(`UPDATE roster_slices SET intake_id = $1 WHERE site_id = $2 AND month = '2033-01-01'`, [fix!.id, site]);
    const run = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000', waitForLockMs: 60_000 });
    if (run.status !== 'succeeded') throw new Error(`the run did not succeed: ${JSON.stringify(run)}`);
    // Two checked intakes as the checks store them (intake-routes and the integration tests make real ones):
    // a roster correction that would orphan R's case, and a case list split by outcome, status and group.
    const checked = async (kind: 'roster' | 'cases', diff: unknown) =>
      (
        (await ds.query(
          `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, row_count, submitted_by_client, checked_at, diff)
         VALUES ($1, 'checked', $2, $3, 1, $4, 3, 'browser-test', now(), $5) RETURNING id`,
          [kind, `${kind}-check.csv`, randomBytes(32).toString('hex'), [site], JSON.stringify(diff)],
        )) as Array<{ id: string }>
      )[0]!.id;
    const slice = {
      siteCode: `RA${c.tag}`,
      month: '2033-01',
      stored: true,
      rows: 5,
      added: 0,
      removed: 1,
      moved: 0,
      hoursChanged: 0,
      unchanged: 5,
      storedHours: 960,
      newHours: 800,
    };
    intakes.roster = await checked('roster', {
      kind: 'roster',
      newWorkers: 0,
      totals: { added: 0, removed: 1, moved: 0, hoursChanged: 0, unchanged: 5, newSlices: 0, replacedSlices: 1 },
      slices: [{ ...slice, workers: { added: [], removed: [`${c.tag}-R`], moved: [], hoursChanged: [] } }],
      orphanedCases: {
        count: 1,
        withheld: null,
        cases: [
          {
            caseRef: refs.removed,
            workerKey: `${c.tag}-R`,
            outcomeCode: `SKIN${c.tag}`,
            onsetDate: '2033-01-15',
            status: 'confirmed',
            siteCode: `RA${c.tag}`,
            month: '2033-01',
          },
        ],
      },
    });
    const cell = (status: string, group: string | null, n: number) => ({
      outcomeCode: `SKIN${c.tag}`,
      status,
      groupCode: group,
      new: { count: n, withheld: null },
      changed: { count: 0, withheld: null },
    });
    intakes.cases = await checked('cases', {
      kind: 'cases',
      new: 23,
      changed: 0,
      unchanged: 0,
      byOutcome: [{ outcomeCode: `SKIN${c.tag}`, new: 23, changed: 0, newWithheld: null, changedWithheld: null }],
      split: [cell('confirmed', `EXP${c.tag}`, 12), cell('confirmed', null, 9), cell('suspected', `EXP${c.tag}`, 2)],
    });
    const sites = await allSiteIds(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
  });

  it('from the run page to the list: each case with its worker, outcome and reason in words; the read is audited', async () => {
    const page = await pageSignedInAs(h, 'physician@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/runs`, { waitUntil: 'networkidle' });
    const note = page.getByRole('region', { name: 'Cases not attributed' });
    await note.waitFor();
    const noteText = (await note.textContent()) ?? '';
    expect(noteText).toContain('Outcome SKIN');
    expect(noteText).toContain('a roster correction removed the worker from that month');
    await note.getByRole('link', { name: 'See the unattributed cases' }).click();
    await page.waitForURL(`${h.app.baseUrl}/runs/unattributed`);
    const table = page.getByRole('table', { name: /^Unattributed cases in run #\d+/ });
    await table.waitFor();
    const rowOf = async (ref: string) => (await table.getByRole('row').filter({ hasText: ref }).textContent()) ?? '';
    const removed = await rowOf(refs.removed);
    expect(removed).toContain(`${c.tag}-R`);
    expect(removed).toContain('Outcome SKIN');
    expect(removed).toContain('2033-01-15');
    expect(removed).toContain('a roster correction removed the worker from that month');
    const noRoster = await rowOf(refs.noRoster);
    expect(noRoster).toContain(`${c.tag}-N`);
    expect(noRoster).toContain('the worker has no roster row with hours in the onset month');
    const audits = (await h.ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'cases.read' AND target LIKE 'run:%:unattributed'`)) as Array<{
      n: number;
    }>;
    expect(audits[0]!.n).toBeGreaterThanOrEqual(1);
    await page.close();
  });

  it('the hygienist reads that cases are not attributed, withheld when few, and no case', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/runs`, { waitUntil: 'networkidle' });
    const note = page.getByRole('region', { name: 'Cases not attributed' });
    await note.waitFor();
    const text = (await note.textContent()) ?? '';
    // One case of each outcome: small, so withheld ("<5"), the reasons with it.
    expect(text).toContain('<5 cases not attributed');
    expect(text).not.toContain(refs.removed);
    expect(await note.getByRole('link', { name: 'See the unattributed cases' }).count()).toBe(0);
    await page.goto(`${h.app.baseUrl}/runs/unattributed`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: 'Not part of your role' }).waitFor();
    expect((await page.content()).includes(refs.removed)).toBe(false);
    await page.close();
  });

  it('reads a roster check that would orphan a case, and a case list split by outcome, status and group', async () => {
    const hyg = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await hyg.goto(`${h.app.baseUrl}/intakes/${intakes.roster}`, { waitUntil: 'networkidle' });
    const warning = hyg.getByRole('alert').filter({ hasText: 'without a roster row' });
    await warning.waitFor();
    expect(await warning.textContent()).toContain('Applying this roster leaves <5 stored cases without a roster row');
    expect(await hyg.getByText(`${c.tag}-R`, { exact: true }).count()).toBe(1);
    expect((await hyg.content()).includes(refs.removed)).toBe(false);
    await hyg.goto(`${h.app.baseUrl}/intakes/${intakes.cases}`, { waitUntil: 'networkidle' });
    const table = hyg.getByRole('table', { name: /New and changed cases by outcome, status and exposure group/ });
    await table.waitFor();
    const text = (await table.textContent()) ?? '';
    // 12 + 9 + 2 under a shown 23: the 2 is small and the 9 its complement ("withheld"); 12 stays.
    expect(text).toContain('not rostered');
    expect(text).toContain('<5');
    expect(text).toContain('withheld');
    expect(text).toContain('12');
    await hyg.close();

    const phys = await pageSignedInAs(h, 'physician@demo.ratewarden.test');
    await phys.goto(`${h.app.baseUrl}/intakes/${intakes.roster}`, { waitUntil: 'networkidle' });
    const cases = phys.getByRole('table', { name: /^Cases that would lose their roster row/ });
    await cases.waitFor();
    expect(await cases.textContent()).toContain(refs.removed);
    expect(await phys.getByRole('alert').filter({ hasText: 'without a roster row' }).textContent()).toContain(
      'Applying this roster leaves 1 stored case without a roster row',
    );
    // The physician reads intakes, but uploads none.
    await phys.goto(`${h.app.baseUrl}/intakes`, { waitUntil: 'networkidle' });
    await phys.getByRole('heading', { level: 1, name: 'Intakes' }).waitFor();
    expect(await phys.getByRole('button', { name: /upload|check/i }).count()).toBe(0);
    await phys.close();
  });
});
