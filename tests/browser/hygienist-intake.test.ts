import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { runIfRequested } from '@ratewarden/worker/runs/request-poller';
import { DEMO_PASSWORD, provisionUser } from '../support/sign-in';
import { useBrowserApp } from '../support/browser-app';

/**
 * The hygienist's journey in Chromium: sign in through the identity provider, upload a roster with
 * the file picker, watch the progress bar, see it checked, open it, read the changes and apply it.
 * Sites and groups get codes of their own so the test meets no other rows.
 */
describe('hygienist uploads a roster in Chromium', () => {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const site = `BS${tag}`;
  const [ga, gb] = [`BA${tag}`, `BB${tag}`];

  const h = useBrowserApp(async (ds) => {
    const sites = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Browser test site') RETURNING id`, [site])) as { id: number }[];
    await ds.query(`INSERT INTO exposure_groups (code, name, hazard, exposure_level) VALUES ($1, 'Browser A', 'none', 0), ($2, 'Browser B', 'noise', 1)`, [
      ga,
      gb,
    ]);
    await provisionUser(
      ds,
      'hygienist@demo.ratewarden.test',
      'hygienist',
      sites.map((s) => s.id),
    );
  });

  it('signs in, uploads, checks and applies a roster, and sees the run it requested complete', async () => {
    const page = await h.browser.context.newPage();
    await page.goto(h.app.baseUrl, { waitUntil: 'networkidle' });
    await page.getByRole('link', { name: 'Sign in', exact: true }).click();
    await page.getByLabel('Work e-mail').fill('hygienist@demo.ratewarden.test');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: /sign in/i }).click();
    await page.waitForURL(`${h.app.baseUrl}/**`);

    // Role-aware navigation: the hygienist sees Intakes, not Administration.
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Intakes' }).click();
    await page.getByRole('heading', { level: 1, name: 'Intakes' }).waitFor();
    expect(await nav.getByRole('link', { name: 'Administration' }).count()).toBe(0);

    const csv = [
      'worker_key,site,exposure_group,month,hours,birth_year,sex,job_title',
      `B${tag}-1,${site},${ga},2023-03,160,1980,F,Clerk`,
      `B${tag}-2,${site},${gb},2023-03,150,1975,M,Grinder`,
    ].join('\n');
    await page.locator('input[type=file]').setInputFiles({ name: `roster-${tag}.csv`, mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.getByRole('button', { name: 'Upload and check' }).click();
    const status = page.getByRole('status').filter({ hasText: `roster-${tag}.csv` });
    await status.waitFor();
    expect(await status.textContent()).toContain('is checked (2 rows)');
    expect(await page.getByRole('progressbar', { name: 'Upload progress' }).getAttribute('value')).toBe('1');

    await status.getByRole('link', { name: 'Open the intake' }).click();
    await page.getByRole('table', { name: /^Changes by site and month/ }).waitFor();
    expect(await page.getByRole('row', { name: new RegExp(`${site} 2023-03`) }).textContent()).toContain('new');
    await page.getByRole('button', { name: 'Apply this intake' }).click();
    await page.getByText('applied', { exact: true }).waitFor();
    const [row] = (await h.ds.query(`SELECT state FROM intakes WHERE file_name = $1`, [`roster-${tag}.csv`])) as { state: string }[];
    expect(row?.state).toBe('applied');

    // The apply requested a run; the worker's on-demand loop takes it up (called here as the worker does).
    await page.getByText(/A run was requested/).waitFor();
    const outcome = await runIfRequested(h.ds, { personTimeBasis: 'person_years', per: 1000, confidence: 0.95, countedStatuses: ['confirmed'] }, h.app.baseUrl);
    expect(outcome?.status).toBe('succeeded');
    await page.getByText(/finished .*, and its figures are the ones shown now\./).waitFor({ timeout: 15_000 });
    await page.close();
  });
});
