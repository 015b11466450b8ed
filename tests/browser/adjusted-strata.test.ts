import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';
import { allSiteIds } from '../support/test-db';

/**
 * The adjusted view's stratum table in Chromium, on the flag fixture (flag-fixture.ts): in
 * December 2032 group EXP has 6 cases among its men and 6 among its women (workers 0–5 alternate
 * M, F, two cases each), group REF 3 among its men and 2 among its women (workers 0–4). Over the
 * rolling year ending in December EXP has 12 and 12. Counts worked out from the fixture by hand.
 */
describe('the adjusted view shows the strata behind an adjusted figure', () => {
  let fx: FlagFixture;
  const h = useBrowserApp(async (ds) => {
    fx = await makeFlagFixture(ds);
    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
  });

  const open = async (email: string, window = 'month') => {
    const page = await pageSignedInAs(h, email);
    const c = fx.cohort;
    await page.goto(`${h.app.baseUrl}/adjusted?outcome=${c.outcomes.DERM}&window=${window}&period=2032-12-01&stratify=sex&group=${c.groups.EXP}`, {
      waitUntil: 'networkidle',
    });
    const table = page.getByRole('table', { name: /^Group EXP against Group REF, by sex/ });
    await table.waitFor();
    return { page, table };
  };
  /** The cells of the stratum's row, header first. */
  const rowCells = async (table: Awaited<ReturnType<typeof open>>['table'], name: string) => {
    const row = table.getByRole('row').filter({ has: table.page().getByRole('rowheader', { name, exact: true }) });
    return [name, ...(await row.getByRole('cell').allTextContents()).map((t) => t.trim())];
  };

  it('gives the physician every stratum with its counts and rate ratio', async () => {
    const { page, table } = await open('physician@demo.ratewarden.test');
    // Columns: stratum, EXP cases, person-time, rate, REF cases, person-time, rate, IRR, IRD.
    const male = await rowCells(table, 'male');
    const female = await rowCells(table, 'female');
    // Men: EXP 6 cases, REF 3, on equal person-time (5 men each at 160 h): IRR 2. Women: EXP 6, REF 2: IRR 3.
    expect([male[1], male[4]]).toEqual(['6', '3']);
    expect(male[7]).toMatch(/^2 \(/);
    expect([female[1], female[4]]).toEqual(['6', '2']);
    expect(female[7]).toMatch(/^3 \(/);
    await page.getByRole('combobox', { name: 'Group', exact: true }).selectOption({ label: 'Group MID' });
    await page.getByRole('table', { name: /^Group MID against Group REF, by sex/ }).waitFor();
    await page.close();
  });

  it("withholds from the hygienist a single month's strata, and a yearly table with a small stratum, in the table and its export", async () => {
    const month = await open('hygienist@demo.ratewarden.test');
    for (const name of ['male', 'female']) {
      const cells = await rowCells(month.table, name);
      expect([cells[1], cells[3], cells[4], cells[7]]).toEqual(['withheld', 'not shown', 'withheld', 'not shown']);
    }
    await month.page.close();
    // The rolling year ending in December is a calendar year: EXP's table (12, 12) is shown,
    // REF's (3, 2) holds small counts and is withheld whole, and the stratum IRR with it.
    const { page, table } = await open('hygienist@demo.ratewarden.test', 'rolling12');
    const male = await rowCells(table, 'male');
    const female = await rowCells(table, 'female');
    expect([male[1], male[4], male[7]]).toEqual(['12', 'withheld', 'not shown']);
    expect([female[1], female[4], female[7]]).toEqual(['12', 'withheld', 'not shown']);
    // The export is built in the page: keep the file's content as it is handed to the browser.
    await page.evaluate(() => {
      const keep = URL.createObjectURL.bind(URL);
      const w = window as unknown as { exported: Blob[] };
      w.exported = [];
      URL.createObjectURL = (b: Blob | MediaSource) => (b instanceof Blob && w.exported.push(b), keep(b));
    });
    await page.getByRole('button', { name: /^Export CSV\W+Group EXP against Group REF/ }).click();
    const csv = await page.evaluate(() => (window as unknown as { exported: Blob[] }).exported.at(-1)!.text());
    expect(csv).toContain('withheld');
    expect(csv).not.toMatch(/^male,12,[^\n]*,3,/m);
    await page.close();
  });
});
