import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';
import { allSiteIds } from '../support/test-db';

/** What has the keyboard focus: its label (form fields) or its text (buttons, links). */
const focused = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLInputElement | null;
    if (!el || el === document.body) return '';
    return (el.labels?.[0]?.textContent ?? el.textContent ?? '').replace(/\s+/g, ' ').trim();
  });

/** Presses Tab until the focused element's label or text starts with `name` (at most 80 presses). */
async function tabTo(page: Page, name: string): Promise<void> {
  for (let i = 0; i < 80; i++) {
    if ((await focused(page)).startsWith(name)) return;
    await page.keyboard.press('Tab');
  }
  throw new Error(`Tab never reached "${name}"`);
}

/** The safety manager reviews and closes a flag with the keyboard alone: Tab, arrows, typing, Enter. */
describe('the flag review works from the keyboard', () => {
  let fx: FlagFixture;
  const h = useBrowserApp(async (ds) => {
    fx = await makeFlagFixture(ds);
    // The fixture's flag is company-wide: seen by readers of every site (other files' sites exist too).
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', await allSiteIds(ds));
  });

  it('starts the review, picks a reason with the arrow keys, writes the comment and closes the flag', async () => {
    const page = await pageSignedInAs(h, 'safety@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/flags/${fx.flagId}`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { level: 1, name: /Group EXP/ }).waitFor();

    await tabTo(page, 'Note for the review');
    await page.keyboard.type('Checking the extraction logs');
    await page.keyboard.press('Tab');
    expect(await focused(page)).toBe('Start the review');
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { level: 1 }).getByText('in review').waitFor();

    await tabTo(page, 'Explained');
    await page.keyboard.press('Space');
    await page.keyboard.press('ArrowRight'); // the next reason in the group: Action taken
    expect(await page.getByLabel(/Action taken/).isChecked()).toBe(true);
    await page.keyboard.press('Tab');
    expect(await focused(page)).toBe('Comment (what was found or done)');
    await page.keyboard.type('Extraction repaired; skin checks offered.');
    await page.keyboard.press('Tab');
    expect(await focused(page)).toBe('Close the flag');
    await page.keyboard.press('Enter');
    await page.getByText(/^Closed .*: Action taken$/).waitFor();

    const [row] = (await h.ds.query(`SELECT state, close_reason, close_comment FROM flags WHERE id = $1`, [fx.flagId])) as Array<Record<string, string>>;
    expect(row).toEqual({ state: 'closed', close_reason: 'action_taken', close_comment: 'Extraction repaired; skin checks offered.' });
    const [review] = (await h.ds.query(`SELECT detail FROM flag_events WHERE flag_id = $1 AND kind = 'review_started'`, [fx.flagId])) as Array<{
      detail: { comment: string };
    }>;
    expect(review!.detail.comment).toBe('Checking the extraction logs');
    await page.close();
  });
});
