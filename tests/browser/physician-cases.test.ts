import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { signInThroughPage, useBrowserApp } from '../support/browser-app';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';
import { allSiteIds } from '../support/test-db';

/** The physician opens a flag in Chromium and sees the case-level records behind it. */
describe('the physician sees the cases behind a flag in Chromium', () => {
  let fx: FlagFixture;

  const h = useBrowserApp(async (ds) => {
    fx = await makeFlagFixture(ds);
    // The fixture's flag is company-wide: seen by readers of every site (other files' sites exist too).
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', await allSiteIds(ds));
  });

  it('lists the cases counted in the flag, and the read is audited', async () => {
    const page = await h.browser.context.newPage();
    await signInThroughPage(page, h.app.baseUrl, 'physician@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/flags/${fx.flagId}`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: 'Cases behind this flag' }).waitFor();
    const table = page.getByRole('table', { name: /^Cases counted \(24\)/ });
    await table.waitFor();
    // The fixture gave six EXP workers two cases each in the flag's window.
    expect(fx.caseRefs).toHaveLength(24);
    const text = (await table.textContent()) ?? '';
    for (const ref of fx.caseRefs) expect(text).toContain(ref);
    expect(text).toContain(`${fx.cohort.tag}-EXP0`);
    // The physician may not review flags: no review controls.
    expect(await page.getByRole('button', { name: 'Close the flag' }).count()).toBe(0);
    const audits = (await h.ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'cases.read' AND target = $1`, [
      `flag:${fx.flagId}`,
    ])) as Array<{ n: number }>;
    expect(audits[0]!.n).toBeGreaterThanOrEqual(1);
    await page.close();
  });
});
