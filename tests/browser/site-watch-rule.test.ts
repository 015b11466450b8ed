import { describe, expect, it } from 'vitest';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { settings } from '../integration/runs-fixture';
import { siteExcessCohort, type SiteExcessCohort } from '../integration/site-excess-cohort';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';

/**
 * The safety manager of two sites writes a watch rule for their sites in Chromium and reads the
 * flag it raises: site one's excess (20 EXP cases against 5, site-excess-cohort.ts), with site
 * one's figures, not the company's (25 EXP cases).
 */
describe('the safety manager of two sites watches their sites in Chromium', () => {
  let fx: SiteExcessCohort;
  const ruleName = `Skin at my sites ${Date.now()}`;
  const h = useBrowserApp(async (ds) => {
    fx = await siteExcessCohort(ds, 2036);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', fx.cohort.sites);
  });

  it("creates a site-level rule and sees its flag with only its site's figures", async () => {
    const page = await pageSignedInAs(h, 'safety@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/rules/new`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { level: 1, name: 'New watch rule' }).waitFor();
    const form = page.getByRole('form', { name: 'Watch rule' });
    await form.getByLabel('Name', { exact: true }).fill(ruleName);
    await form.getByLabel('Outcome', { exact: true }).selectOption(String(fx.cohort.outcomes.SKIN));
    // Without every site, the company is not on offer: the rule watches the person's own sites.
    expect(await form.getByRole('radio', { name: /The whole company/ }).isDisabled()).toBe(true);
    expect(await form.getByRole('radio', { name: /Chosen sites/ }).isChecked()).toBe(true);
    const sites = form.getByRole('group', { name: 'Sites watched' });
    expect(await sites.getByRole('checkbox').count()).toBe(2);
    expect(await sites.getByRole('checkbox', { name: 'Run test site one' }).isChecked()).toBe(true);
    expect(await sites.getByRole('checkbox', { name: 'Run test site two' }).isChecked()).toBe(true);
    expect(await form.textContent()).toContain('over one family per period: every exposure group the rule covers × every chosen site, each on its own results');
    await page.getByRole('button', { name: 'Create the rule' }).click();
    await page.getByRole('heading', { level: 1, name: 'Watch rules' }).waitFor();
    const row = page
      .getByRole('table', { name: /^Watch rules/ })
      .getByRole('row')
      .filter({ has: page.getByRole('link', { name: ruleName, exact: true }) });
    expect(await row.getByRole('cell').allTextContents()).toContain('Run test site one, Run test site two');
    const [stored] = (await h.ds.query(`SELECT site_ids FROM watch_rules WHERE name = $1`, [ruleName])) as Array<{ site_ids: number[] }>;
    expect(stored!.site_ids).toEqual([...fx.cohort.sites].sort((a, b) => a - b));

    const o = await performRun(h.ds, { trigger: 'cli', settings, appUrl: h.app.baseUrl, waitForLockMs: 60_000 });
    expect(o.status).toBe('succeeded');

    await page.goto(`${h.app.baseUrl}/flags?outcome=${fx.cohort.outcomes.SKIN}`, { waitUntil: 'networkidle' });
    const flagRow = page
      .getByRole('table', { name: /^Flags/ })
      .getByRole('row')
      .filter({ hasText: ruleName });
    expect(await flagRow.count()).toBe(1);
    expect(await flagRow.getByRole('cell').allTextContents()).toContain('Run test site one');
    await flagRow.getByRole('link', { name: 'Group EXP' }).click();
    await page.getByRole('heading', { level: 1, name: /Group EXP: Outcome SKIN at Run test site one/ }).waitFor();
    const figures = page.getByRole('table', { name: /numbers that triggered/ });
    // Site one's 20 cases over its 1.6 person-years; the company's would be 25 over 6.4.
    expect(await figures.getByRole('row', { name: /^Cases/ }).textContent()).toMatch(/Cases\s*20$/);
    expect(await figures.getByRole('row', { name: /^Person-time/ }).textContent()).toContain('1.6');
    expect(await figures.getByRole('row', { name: /^Site/ }).textContent()).toContain('Run test site one (its own results)');
    expect(await figures.getByRole('row', { name: /^Period/ }).textContent()).toContain('complete');
    await page.close();
  });
});
