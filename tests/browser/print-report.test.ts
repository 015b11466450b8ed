import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { clearCohortData } from '../integration/runs-fixture';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';
import { allSiteIds } from '../support/test-db';

/** The print stylesheet: a results page prints as a clean report (no navigation or controls, the cautions in full). */
describe('printing a results page', () => {
  let fx: FlagFixture;
  const h = useBrowserApp(async (ds) => {
    // Runs are company-wide: alone with its cohort, the page holds what one report page should
    // (other files' cohorts would add their groups to the same month).
    await clearCohortData(ds);
    fx = await makeFlagFixture(ds);
    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
  });

  it('leaves out navigation, filters and buttons, keeps the figures with their table headers, the settings line and cautions, on one A4 page', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/comparison?outcome=${fx.cohort.outcomes.DERM}&window=month&period=2032-12-01`, { waitUntil: 'networkidle' });
    await page.getByRole('table', { name: /^Comparison with the reference group/ }).waitFor();
    expect(await page.getByRole('button', { name: 'Print this page' }).isVisible()).toBe(true);
    const table = page.getByRole('table', { name: /^Comparison with the reference group/ });
    const onScreen = (await table.locator('thead th').allInnerTexts()).map((s) =>
      s
        .replace(/[▲▼↕]/g, '')
        .replace(/,\s*sort[\s\S]*$/, '')
        .trim(),
    );
    await page.emulateMedia({ media: 'print' });
    // Sortable headers are buttons on screen and print hides buttons: the printed headers keep their words.
    const printed = (await table.locator('thead th').allInnerTexts()).map((s) => s.trim());
    expect(printed).toEqual(onScreen);
    expect(printed).toContain('Exposure group');
    expect(await table.locator('thead th').filter({ visible: true }).count()).toBe(onScreen.length);
    const shown = (role: Parameters<typeof page.getByRole>[0], name?: RegExp) =>
      page
        .getByRole(role, name ? { name } : {})
        .first()
        .isVisible();
    expect(await shown('navigation')).toBe(false);
    expect(await page.getByRole('form', { name: 'Choose what to show' }).isVisible()).toBe(false);
    expect(await page.getByRole('button').filter({ visible: true }).count()).toBe(0);
    expect(await shown('table', /^Comparison with the reference group/)).toBe(true);
    expect(await page.getByLabel('Units and settings').isVisible()).toBe(true);
    // The cautions print in full.
    expect(await page.getByText('The healthy-worker effect biases comparisons with the general population.').filter({ visible: true }).count()).toBe(1);
    const pdf = await page.pdf({ format: 'A4', printBackground: false });
    const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
    expect(pages).toBe(1);
    await page.close();
  });
});
