import { randomBytes } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { runIfRequested } from '@ratewarden/worker/runs/request-poller';
import { settings } from '../integration/runs-fixture';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';

/**
 * Issue 15's first "done when", in Chromium: the administrator creates a site and changes the
 * confidence level to 90 %; the next run (the worker's request loop, called here as the worker
 * calls it) computes with it, and every page of results the hygienist reads says 90 % and names
 * the settings version beside its figures. Then the hygienist offers calendar quarters (issue 15's
 * analysis windows) and the results pages offer them after the next run.
 */
describe('the administrator creates a site and sets 90 % intervals; the next run shows them', () => {
  let fx: FlagFixture;
  const code = `S${randomBytes(3).toString('hex').toUpperCase()}`;
  const h = useBrowserApp(async (ds) => {
    fx = await makeFlagFixture(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
  });
  afterAll(async () => {
    // The test database's settings are shared: later files compute with the defaults again.
    await h.ds.query(
      `INSERT INTO analysis_settings (version, settings, created_by_label) SELECT max(version) + 1, $1::jsonb, 'test: defaults again' FROM analysis_settings`,
      [JSON.stringify({ ...settings, ageBandEdges: [10, 20, 30, 40, 50, 60, 70, 80, 90] })],
    );
  });

  it('creates the site, saves the new version, and the run shows 90 % and the version on every results page', async () => {
    const admin = await pageSignedInAs(h, 'admin@demo.ratewarden.test');
    const nav = admin.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Sites', exact: true }).click();
    await admin.getByRole('heading', { level: 1, name: 'Sites' }).waitFor();
    await admin.getByRole('button', { name: 'New site' }).click();
    const form = admin.getByRole('form', { name: 'New site' });
    await form.getByLabel('Code').fill(code.toLowerCase());
    await form.getByLabel('Name').fill('Harbour workshop');
    await form.getByRole('button', { name: 'Create the site' }).click();
    await admin
      .getByRole('table', { name: /^Sites \(/ })
      .getByRole('row')
      .filter({ hasText: code })
      .filter({ hasText: 'Harbour workshop' })
      .waitFor();
    const [site] = (await h.ds.query(`SELECT name, retired_at FROM sites WHERE code = $1`, [code])) as Array<{ name: string; retired_at: Date | null }>;
    expect(site).toEqual({ name: 'Harbour workshop', retired_at: null });

    await nav.getByRole('link', { name: 'Analysis settings' }).click();
    await admin.getByRole('heading', { level: 1, name: 'Analysis settings' }).waitFor();
    const settingsForm = admin.getByRole('form', { name: 'Change the analysis settings' });
    await settingsForm.getByLabel('Confidence level').selectOption({ label: '90%' });
    await settingsForm.getByRole('button', { name: 'Save as a new version' }).click();
    const saved = await admin
      .getByRole('status')
      .filter({ hasText: /Saved as version \d+; a run has been requested\./ })
      .textContent();
    const version = Number(/version (\d+)/.exec(saved!)![1]);
    await admin.getByText(`Current: version ${version}`, { exact: false }).waitFor();
    await admin.close();

    const [request] = (await h.ds.query(`SELECT reason FROM run_requests WHERE picked_at IS NULL ORDER BY requested_at DESC LIMIT 1`)) as Array<{
      reason: string;
    }>;
    expect(request!.reason).toContain(`analysis settings changed to version ${version}`);
    const outcome = await runIfRequested(h.ds, settings, h.app.baseUrl);
    expect(outcome?.status).toBe('succeeded');

    // The new site is one more site to be given: company-wide figures are for readers of every site.
    await provisionUser(h.ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(h.ds));
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    const outcomeId = fx.cohort.outcomes.DERM!;
    for (const path of [
      '/overview',
      `/trends?outcome=${outcomeId}`,
      `/comparison?outcome=${outcomeId}&window=month&period=2032-12-01`,
      `/adjusted?outcome=${outcomeId}&window=month&period=2032-12-01&stratify=sex`,
      `/flags/${fx.flagId}`,
    ]) {
      await page.goto(`${h.app.baseUrl}${path}`, { waitUntil: 'networkidle' });
      const strip = page.locator('dl[aria-label="Units and settings"]').first();
      await strip.waitFor({ timeout: 15_000 }).catch(async (err: unknown) => {
        throw new Error(`${path}: no units strip; the page reads: ${(await page.locator('main').textContent())?.slice(0, 600)}`, { cause: err });
      });
      const text = await strip.textContent();
      expect(text, path).toContain('Confidence level:90%');
      expect(text, path).toContain(`Analysis settings:version ${version}`);
    }
    // The run history names the version of each run.
    await page.goto(`${h.app.baseUrl}/runs`, { waitUntil: 'networkidle' });
    const history = page.getByRole('table', { name: /^Runs \(/ });
    expect(await history.getByRole('row').nth(1).textContent()).toContain(`version ${version}`);
    await page.close();
  });

  it('the hygienist offers calendar quarters; the next run offers "Calendar quarter" on the results pages and shows a quarter', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/settings`, { waitUntil: 'networkidle' });
    const form = page.getByRole('form', { name: 'Change the analysis settings' });
    const windows = form.getByRole('group', { name: 'Analysis windows offered' });
    // The month is always offered: its box is checked and cannot be cleared.
    expect(await windows.getByLabel('Single month').isChecked()).toBe(true);
    expect(await windows.getByLabel('Single month').isDisabled()).toBe(true);
    await windows.getByLabel('Calendar quarter').check();
    await form.getByRole('button', { name: 'Save as a new version' }).click();
    const saved = await page
      .getByRole('status')
      .filter({ hasText: /Saved as version \d+; a run has been requested\./ })
      .textContent();
    const version = Number(/version (\d+)/.exec(saved!)![1]);
    const [stored] = (await h.ds.query(`SELECT settings FROM analysis_settings WHERE version = $1`, [version])) as Array<{ settings: { windows: string[] } }>;
    expect(stored!.settings.windows).toContain('quarter');
    const outcome = await runIfRequested(h.ds, settings, h.app.baseUrl);
    expect(outcome?.status).toBe('succeeded');

    await page.goto(`${h.app.baseUrl}/comparison?outcome=${fx.cohort.outcomes.DERM!}`, { waitUntil: 'networkidle' });
    const choice = page.getByRole('form', { name: 'Choose what to show' });
    const options = await choice.getByLabel('Window').locator('option').allTextContents();
    expect(options).toContain('Calendar quarter');
    await choice.getByLabel('Window').selectOption({ label: 'Calendar quarter' });
    // The fixture's months (November and December 2032) make one quarter, the fourth.
    await expect.poll(() => choice.getByLabel('Calendar quarter').locator('option').allTextContents()).toEqual(['Q4 2032']);
    const table = page.getByRole('table', { name: /calendar quarter Q4 2032 \(Oct 2032 to Dec 2032\)/ });
    await table.waitFor();
    // One row per group (REF, MID, EXP) under the header row.
    expect(await table.getByRole('row').count()).toBe(4);
    await page.close();
  });
});
