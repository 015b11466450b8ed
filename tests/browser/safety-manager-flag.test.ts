import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { signInThroughPage, useBrowserApp } from '../support/browser-app';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';
import { allSiteIds } from '../support/test-db';

/**
 * The safety manager's journey in Chromium: sign in, open the flag from the flags list, read the
 * numbers that triggered it, start the review and close it with a reason and a comment. The
 * cases behind the flag stay out of sight (physician only).
 */
describe('the safety manager reviews and closes a flag in Chromium', () => {
  let fx: FlagFixture;

  const h = useBrowserApp(async (ds) => {
    fx = await makeFlagFixture(ds);
    // A flag's figures are the company's: for a reader of every site (other files' sites exist too).
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', await allSiteIds(ds));
  });

  it('opens the flag, reviews it and closes it with a reason', async () => {
    const page = await h.browser.context.newPage();
    await signInThroughPage(page, h.app.baseUrl, 'safety@demo.ratewarden.test');
    await page.getByRole('heading', { level: 1, name: 'Flags' }).waitFor();

    await page.goto(`${h.app.baseUrl}/flags?outcome=${fx.cohort.outcomes.DERM}`, { waitUntil: 'networkidle' });
    await page.getByRole('link', { name: 'Group EXP' }).click();
    await page.getByRole('heading', { level: 1, name: /Group EXP/ }).waitFor();
    const figures = page.getByRole('table', { name: /numbers that triggered/ });
    // 24 EXP cases (the fixture): at or above the small-cell threshold, so shown to the safety manager.
    expect(await figures.getByRole('row', { name: /^Cases/ }).textContent()).toContain('24');
    expect(await page.getByRole('heading', { name: 'Cases behind this flag' }).count()).toBe(0);

    await page.getByRole('button', { name: 'Start the review' }).click();
    await page.getByRole('heading', { level: 1 }).getByText('in review').waitFor();

    await page.getByRole('button', { name: 'Close the flag' }).click();
    await page.getByRole('alert').filter({ hasText: 'Choose a reason' }).waitFor();
    await page.getByLabel(/Action taken/).check();
    await page.getByLabel('Comment (what was found or done)').fill('Extraction in the bay checked and repaired; skin checks offered.');
    await page.getByRole('button', { name: 'Close the flag' }).click();
    await page.getByText(/^Closed .*: Action taken$/).waitFor();
    expect(await page.getByRole('table', { name: 'Decision history' }).textContent()).toContain('Extraction in the bay checked and repaired');

    const [row] = (await h.ds.query(`SELECT state, close_reason, close_comment FROM flags WHERE id = $1`, [fx.flagId])) as Array<Record<string, string>>;
    expect(row).toEqual({ state: 'closed', close_reason: 'action_taken', close_comment: 'Extraction in the bay checked and repaired; skin checks offered.' });
    await page.close();
  });
});
