import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { receiveIntake } from '@ratewarden/api/features/intake/intake-receive';
import { applyIntake } from '@ratewarden/api/features/intake/intake-service';
import type { Principal } from '@ratewarden/shared/permissions';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { settings } from '../integration/runs-fixture';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';

const PHYSICIAN = 'physician@demo.ratewarden.test';

/**
 * The physician's workspace in Chromium (issue 16): reads the threshold notice in the inbox, opens
 * the flag, writes a clinical note, rules out one counted case and confirms a suspected one with
 * reasons, and after the next run sees it count them so; then a case list that contradicts the
 * ruling shows the conflict on the intake's page and the physician keeps the decision.
 */
describe("the physician's notices, case review and conflicts in Chromium", () => {
  let fx: FlagFixture;
  let suspectedRef: string;
  let hygienist: Principal;

  const h = useBrowserApp(async (ds) => {
    // Told of company flags: a physician exists before the fixture's run raises the flag.
    await provisionUser(ds, PHYSICIAN, 'physician');
    fx = await makeFlagFixture(ds);
    const sites = await allSiteIds(ds);
    await provisionUser(ds, PHYSICIAN, 'physician', sites);
    const hygienistId = await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    hygienist = { kind: 'user', id: hygienistId, email: 'hygienist@demo.ratewarden.test', name: 'Hygienist', role: 'hygienist', siteIds: sites };
    // A suspected case of an EXP worker who has none counted, in the flag's window: not counted until confirmed.
    suspectedRef = `${fx.cohort.tag}-S1`;
    await ds.query(
      `INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status)
       SELECT $1, $2, w.id, $3, '2032-12-15', 'suspected' FROM workers w WHERE w.worker_key = $4`,
      [fx.cohort.casesIntake, suspectedRef, fx.cohort.outcomes.DERM, `${fx.cohort.tag}-EXP7`],
    );
  });

  it('reads the notice, opens the flag, decides two cases with reasons, and the next run counts them', async () => {
    const ruledOut = fx.caseRefs[0]!;
    const page = await pageSignedInAs(h, PHYSICIAN);
    await page.goto(`${h.app.baseUrl}/notices`, { waitUntil: 'networkidle' });
    const inbox = page.getByRole('table', { name: /^Your notices/ });
    await inbox.waitFor();
    const row = inbox.getByRole('row').filter({ hasText: fx.cohort.tag });
    expect(await row.textContent()).toContain('New');
    expect(await row.textContent()).toContain('Dec 2032, complete');
    await row.getByRole('link', { name: /^Ratewarden: watch rule .* raised a flag/ }).click();
    await page.getByRole('heading', { level: 1, name: /raised a flag/ }).waitFor();
    expect(await page.locator('pre').textContent()).toContain('Cases in the group: 24');
    await page.getByRole('link', { name: 'Open the flag' }).click();
    await page.waitForURL(`**/flags/${fx.flagId}`);
    await page.getByRole('table', { name: /^Cases counted \(24\)/ }).waitFor();

    // A clinical note on the flag.
    await page.getByLabel('New note').fill('Six workers of one shift; asked for their hire audiograms.');
    await page.getByRole('button', { name: 'Add the note' }).click();
    await page.getByText('Six workers of one shift; asked for their hire audiograms.').waitFor();

    // Rule out a counted case, from the flag's list.
    await page.getByRole('link', { name: ruledOut, exact: true }).click();
    await page.getByRole('heading', { level: 1, name: `Case ${ruledOut}` }).waitFor();
    await page.getByRole('radio', { name: 'Rule the case out' }).check();
    await page.getByRole('button', { name: 'Save the decision' }).click();
    // No reason: the form says so and saves nothing.
    await page.getByRole('alert').filter({ hasText: 'give a reason' }).waitFor();
    await page.getByLabel(/^Reason/).fill('Contact dermatitis from a hobby, not work; patch test negative for the plant allergens');
    await page.getByRole('button', { name: 'Save the decision' }).click();
    await page.getByRole('status').filter({ hasText: 'the case is now ruled out' }).waitFor();
    expect(await page.getByRole('table', { name: /^Versions/ }).textContent()).toContain('patch test negative');

    // Confirm the suspected one, found in the register.
    await page.goto(`${h.app.baseUrl}/cases?q=${suspectedRef}`, { waitUntil: 'networkidle' });
    await page.getByRole('link', { name: suspectedRef, exact: true }).click();
    await page.getByRole('radio', { name: 'Confirm the case' }).check();
    await page.getByLabel(/^Reason/).fill('Seen in clinic: eczema of both hands, onset at work');
    await page.getByRole('button', { name: 'Save the decision' }).click();
    await page.getByRole('status').filter({ hasText: 'the case is now confirmed' }).waitFor();

    // Both decisions asked for a run; the worker's run (here called directly) counts them.
    const pending = (await h.ds.query(
      `SELECT count(*)::int AS n FROM run_requests WHERE picked_at IS NULL AND reason = 'a physician reviewed a case'`,
    )) as Array<{ n: number }>;
    expect(pending[0]!.n).toBe(2);
    const run = await performRun(h.ds, { trigger: 'cli', settings, appUrl: h.app.baseUrl, waitForLockMs: 60_000 });
    expect(run.status).toBe('succeeded');
    await page.goto(`${h.app.baseUrl}/flags/${fx.flagId}`, { waitUntil: 'networkidle' });
    const counted = page.getByRole('table', { name: /^Cases counted \(24\)/ });
    await counted.waitFor();
    const text = (await counted.textContent()) ?? '';
    expect(text).toContain(suspectedRef);
    expect(await counted.getByRole('link', { name: ruledOut, exact: true }).count()).toBe(0);
    await page.goto(`${h.app.baseUrl}/cases?q=${ruledOut}`, { waitUntil: 'networkidle' });
    const register = page.getByRole('table', { name: /^Cases \(/ });
    await register.waitFor();
    const ruledRow = register.getByRole('row').filter({ has: page.getByRole('link', { name: ruledOut, exact: true }) });
    expect(await ruledRow.textContent()).toContain('Ruled out (physician)');
    expect(await ruledRow.textContent()).toContain('Not counted');
    const reads = (await h.ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'cases.read' AND actor_label = $1`, [PHYSICIAN])) as Array<{
      n: number;
    }>;
    expect(reads[0]!.n).toBeGreaterThanOrEqual(5);
    await page.close();
  });

  it('a case list contradicting the ruling shows the conflict, and the physician keeps the decision', async () => {
    const ruledOut = fx.caseRefs[0]!;
    const [c] = (await h.ds.query(
      `SELECT w.worker_key, to_char(e.onset_date, 'YYYY-MM-DD') AS onset FROM case_events e JOIN workers w ON w.id = e.worker_id WHERE e.case_ref = $1 AND e.superseded_by IS NULL`,
      [ruledOut],
    )) as Array<{ worker_key: string; onset: string }>;
    const csv = `case_ref,worker_key,outcome,onset_date,status\n${ruledOut},${c!.worker_key},DERM${fx.cohort.tag},${c!.onset},confirmed\n`;
    const { intake } = await receiveIntake(h.ds, {
      kind: 'cases',
      mode: 'apply',
      fileName: 'cases-later.csv',
      principal: hygienist,
      stream: Readable.from([Buffer.from(csv)]),
      allowFutureMonths: true,
    });
    expect(intake.problems).toEqual([]);
    expect(intake).toMatchObject({ state: 'checked', conflictsPending: true });

    const page = await pageSignedInAs(h, PHYSICIAN);
    await page.goto(`${h.app.baseUrl}/intakes/${intake.id}`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: "Conflicts with physicians' decisions" }).waitFor();
    const table = page.getByRole('table', { name: /^Conflicts \(1\)/ });
    expect(await table.textContent()).toContain('patch test negative');
    await page.getByRole('button', { name: `Keep the decision on ${ruledOut}` }).click();
    await table.getByText('Decision kept').waitFor();
    await page.close();

    const applied = await applyIntake(h.ds, hygienist, intake.id, null, { allowFutureMonths: true });
    expect(applied.state).toBe('applied');
    const [now] = (await h.ds.query(`SELECT status, review_id IS NOT NULL AS reviewed FROM case_events WHERE case_ref = $1 AND superseded_by IS NULL`, [
      ruledOut,
    ])) as Array<{ status: string; reviewed: boolean }>;
    expect(now).toEqual({ status: 'ruled_out', reviewed: true });
  });
});
