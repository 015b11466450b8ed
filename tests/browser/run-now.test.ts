import { describe, expect, it } from 'vitest';
import { runIfRequested } from '@ratewarden/worker/runs/request-poller';
import { settings } from '../integration/runs-fixture';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';

/**
 * The hygienist's run button in Chromium: the press writes a run request, the worker's on-demand
 * loop takes it up (called here as the worker does), and the run history shows the run finished,
 * succeeded and live, with the run button as its trigger.
 */
describe('the hygienist asks for a run now in Chromium', () => {
  const h = useBrowserApp(async (ds) => {
    const [site] = (await ds.query(
      `INSERT INTO sites (code, name) VALUES ('RN' || upper(substr(md5(random()::text), 1, 6)), 'Run-now test site') RETURNING id`,
    )) as Array<{ id: number }>;
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', [site!.id]);
  });

  it('presses Run now, and the history shows the run succeeded with its trigger', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Runs', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Run history' }).waitFor();
    const [{ last }] = (await h.ds.query(`SELECT coalesce(max(number), 0)::int AS last FROM runs`)) as [{ last: number }];

    await page.getByRole('button', { name: 'Run now' }).click();
    await page.getByRole('status').filter({ hasText: 'Run requested; waiting for the worker' }).waitFor();
    const pending = (await h.ds.query(`SELECT reason FROM run_requests WHERE picked_at IS NULL`)) as Array<{ reason: string }>;
    expect(pending.map((r) => r.reason)).toContain('run requested by hygienist@demo.ratewarden.test');

    const outcome = await runIfRequested(h.ds, settings, h.app.baseUrl);
    expect(outcome?.status).toBe('succeeded');
    const [run] = (await h.ds.query(`SELECT number::int AS number, trigger, state FROM runs WHERE id = $1`, [
      outcome?.status === 'succeeded' ? outcome.runId : null,
    ])) as Array<{ number: number; trigger: string; state: string }>;
    expect(run).toMatchObject({ trigger: 'request', state: 'succeeded' });
    expect(run!.number).toBeGreaterThan(last);

    // The page polls until the requested run has finished.
    await page
      .getByRole('status')
      .filter({ hasText: `Run #${run!.number} has finished` })
      .waitFor({ timeout: 30_000 });
    const history = page.getByRole('table', { name: /^Runs \(/ });
    const row = history.getByRole('row').filter({ has: page.getByRole('cell', { name: new RegExp(`^#${run!.number}(?!\\d)`) }) });
    expect(await row.getByRole('cell').allTextContents()).toEqual(expect.arrayContaining([`#${run!.number}live`, 'run button', 'succeeded']));
    expect(await row.textContent()).toContain('run requested by hygienist@demo.ratewarden.test');
    // Newest first: the requested run heads the history.
    expect(await history.getByRole('row').nth(1).textContent()).toBe(await row.textContent());
    await page.close();
  });
});
