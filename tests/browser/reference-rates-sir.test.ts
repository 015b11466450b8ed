import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { describe, expect, it } from 'vitest';
import { formatFigure } from '@ratewarden/shared/number-format';
import { runIfRequested } from '@ratewarden/worker/runs/request-poller';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';
import { makeCohort, settings, type Cohort } from '../integration/runs-fixture';

/**
 * The hygienist's SIR journey in Chromium: a refused reference-rate file with its problems by line
 * and column, a good one uploaded through the page, the run it asks for, and the SIR page read back:
 * 5 women born 1980 work 12 × 160 h in 2031 (4.8 person-years at 2,000 h); the reference rate for
 * women aged 45–54 in 2031 is 0.5 per person-year, so E = 2.4; with O = 10 the SIR is 10/2.4, its
 * exact 95% limits χ²(0.025; 20)/2/E and χ²(0.975; 22)/2/E (Garwood 1936; Ulm 1990).
 */
describe('the hygienist uploads reference rates and reads the SIR page', () => {
  let c: Cohort;
  const h = useBrowserApp(async (ds) => {
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['HEAR', 'recurrent']],
    });
    const workers: number[] = [];
    for (let i = 0; i < 5; i++) workers.push(await c.worker(`s${i}`, 1980, 'F'));
    const rows: Array<[number, string, number, number, number]> = [];
    for (const w of workers) for (let m = 1; m <= 12; m++) rows.push([w, `2031-${String(m).padStart(2, '0')}-01`, c.sites[0]!, c.groups.EXP!, 160]);
    await c.roster(rows);
    // Five cases in March and five in September: no count of the group is small, so the hygienist sees its SIR.
    await c.cases(
      workers.flatMap(
        (w) =>
          [
            [w, c.outcomes.HEAR!, '2031-03-10'],
            [w, c.outcomes.HEAR!, '2031-09-10'],
          ] as Array<[number, number, string]>,
      ),
    );
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
  });

  it('sees a bad file refused by line and column, uploads a good one, and reads the SIR with its interval and the healthy-worker caution', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/overview`, { waitUntil: 'networkidle' });
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Against reference rates' }).click();
    await page.getByRole('heading', { level: 1, name: 'Against reference rates (SIR)' }).waitFor();
    await page
      .getByText(/Healthy-worker effect/)
      .first()
      .waitFor();

    const header = 'outcome,sex,age_from,age_to,year,rate_per_person_year,source';
    const fileInput = page.getByLabel('Reference-rate file (CSV)');
    await fileInput.setInputFiles({ name: 'bad-rates.csv', mimeType: 'text/csv', buffer: Buffer.from(`${header}\nHEAR${c.tag},F,45,54,2031,lots,Registry\n`) });
    await page.getByRole('button', { name: 'Upload reference rates' }).click();
    const alert = page.getByRole('alert');
    await alert.getByRole('table', { name: 'Problems by line and column' }).waitFor();
    expect(await alert.getByRole('row').nth(1).textContent()).toContain('rate_per_person_year');
    expect(await alert.getByRole('row').nth(1).textContent()).toMatch(/^2/);

    const good = `${header}\nHEAR${c.tag},F,45,54,2031,0.5,Invented registry table 2031\nHEAR${c.tag},M,45,54,2031,0.4,Invented registry table 2031\n`;
    await fileInput.setInputFiles({ name: 'rates.csv', mimeType: 'text/csv', buffer: Buffer.from(good) });
    await page.getByRole('button', { name: 'Upload reference rates' }).click();
    await page.getByRole('status').filter({ hasText: 'Reference rates applied' }).waitFor();
    await page.getByRole('cell', { name: 'Invented registry table 2031' }).waitFor();

    // The upload asked for a run; the worker's on-demand loop takes it up (called here as the worker does).
    const outcome = await runIfRequested(h.ds, settings, h.app.baseUrl);
    expect(outcome?.status).toBe('succeeded');
    await page.goto(`${h.app.baseUrl}/sir?outcomeId=${c.outcomes.HEAR}`, { waitUntil: 'networkidle' });
    const table = page.getByRole('table', { name: /^SIR by exposure group/ });
    await table.waitFor();
    const row = (await table
      .getByRole('row', { name: /^Group EXP 10 / }) /* other files' cohorts may have a group of the same name, with nothing observed */
      .textContent())!;
    const e = 2.4;
    expect(row).toContain('10'); // observed
    expect(row).toContain(formatFigure(e)); // expected
    expect(row).toContain(formatFigure(10 / e)); // SIR = O / E
    expect(row).toContain(`${formatFigure(chisquareQuantile(0.025, 20) / 2 / e)} to ${formatFigure(chisquareQuantile(0.975, 22) / 2 / e)}`);
    expect(
      await page
        .locator('figure')
        .getByText(/SIR against the reference rates with 95% exact intervals/)
        .first()
        .isVisible(),
    ).toBe(true);
    expect(await page.getByText(/reference rates version \d+ \(Invented registry table 2031\)/).count()).toBe(1);
    await page.close();
  });
});
