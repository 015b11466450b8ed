import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';
import { plantAudiograms } from './audiogram-fixture';

/**
 * The hygienist uploads audiograms through the page (and never sees what they show); the
 * physician opens the worker's audiogram page: both ears charted, the baseline in use, the shift
 * with its computation (left ear: changes 15, 15, 15 against the baseline → average 15 dB, a
 * standard threshold shift per 29 CFR 1910.95(g)(10); Table F-1 rows for ages 34–35 are not in
 * the stored reference, so uncorrected, said on the page), the suspected case, and the cautions.
 */
describe("the physician reads a worker's audiograms and the shift derived from them", () => {
  let planted = '';
  let uploadedKey = '';
  const h = useBrowserApp(async (ds) => {
    // People see workers of their sites only: one site of this file's own, at least.
    await ds.query(`INSERT INTO sites (code, name) VALUES ('AUDSITE', 'Audiogram test site') ON CONFLICT (code) DO NOTHING`);
    const sites = await allSiteIds(ds);
    planted = await plantAudiograms(ds, sites);
    // The hearing outcome the shifts become cases of (HEARING_OUTCOME_CODE, default STS).
    await ds.query(
      `INSERT INTO outcomes (code, name, case_definition, counting_rule) VALUES ('STS', 'Standard threshold shift', 'test', 'first_event') ON CONFLICT (code) DO NOTHING`,
    );
    uploadedKey = `${planted.slice(0, -2)}-2`;
    await ds.query(`INSERT INTO workers (worker_key, birth_year, sex) VALUES ($1, 1988, 'F')`, [uploadedKey]);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
  });

  it('the hygienist uploads a CSV with the keyboard and reads only the rows stored', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/hearing/upload`, { waitUntil: 'networkidle' });
    const csv = [
      'worker_key,test_date,ear,test_type,hl_500,hl_1000,hl_2000,hl_3000,hl_4000,hl_6000,hl_8000',
      `${uploadedKey},2024-02-01,left,baseline,5,5,5,5,5,10,`,
      `${uploadedKey},2025-02-01,left,annual,5,5,20,20,20,10,`,
    ].join('\n');
    await page.getByLabel('Audiogram file (.csv or .xlsx)').setInputFiles({ name: 'audiograms.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.getByRole('button', { name: 'Upload' }).focus();
    await page.keyboard.press('Enter');
    await expect.poll(async () => page.getByRole('status').textContent()).toContain('Stored 2 audiogram rows of 1 workers');
    expect(await page.getByText(/threshold shift: a suspected case/i).count()).toBe(0);
    await page.close();
    const cases = (await h.ds.query(`SELECT e.status FROM case_events e JOIN workers w ON w.id = e.worker_id WHERE w.worker_key = $1`, [
      uploadedKey,
    ])) as Array<{ status: string }>;
    expect(cases).toEqual([{ status: 'suspected' }]);
  });

  it('the physician opens the worker from the list and reads the chart, the baseline and the computation', async () => {
    const page = await pageSignedInAs(h, 'physician@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/hearing`, { waitUntil: 'networkidle' });
    await page.getByRole('link', { name: planted }).click();
    await page.getByRole('heading', { level: 1, name: `Audiograms of ${planted}` }).waitFor();
    // Both ears charted (ECharts as SVG), each with its table alternative.
    await expect.poll(async () => page.locator('figure svg').count()).toBeGreaterThanOrEqual(2);
    const left = page.getByRole('region', { name: 'Left ear' });
    await expect.poll(async () => left.textContent()).toContain('Baseline in use: 2024-06-10 (baseline). Shifts found: 1.');
    const text = (await left.textContent()) ?? '';
    expect(text).toContain('2025-06-10 against the baseline of 2024-06-10: Standard threshold shift: a suspected case for your review');
    expect(text).toContain('Average change 15 dB');
    expect(text).toContain('No age correction: Table F-1 value missing from the stored reference');
    await left.getByRole('button', { name: 'Show as a table' }).click();
    expect(await left.getByRole('row', { name: /2025-06-10 annual/ }).textContent()).toContain('25');
    const right = page.getByRole('region', { name: 'Right ear' });
    expect(await right.textContent()).toContain('Shifts found: 0.');
    expect(await page.getByRole('complementary', { name: 'Cautions' }).textContent()).toContain('local rules may differ');
    await page.close();
  });

  it('other roles get the page refused, and the server refuses the read', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/hearing/workers/${planted}`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: 'Not part of your role' }).waitFor();
    expect(await page.content()).not.toContain('Average change');
    await page.close();
  });
});
