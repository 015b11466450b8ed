import { describe, expect, it } from 'vitest';
import { intakeColumns } from '@ratewarden/shared/intake-columns';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';

/**
 * The intake page offers both templates and the format rules the server checks (GET
 * /api/intakes/formats); the administrator's first-run page lists the set-up steps with their state.
 */
describe('intake formats on the intake page, and the first-run page', () => {
  const h = useBrowserApp(async (ds) => {
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
  });

  it('links both templates, which download, and lists every column of both formats', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/intakes`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: 'Templates and format rules' }).waitFor();
    for (const [name, file, firstColumn] of [
      ['roster template (roster.csv)', 'roster.csv', 'worker_key'],
      ['case list template (cases.csv)', 'cases.csv', 'case_ref'],
    ] as const) {
      const link = page.getByRole('link', { name });
      expect(await link.getAttribute('href')).toBe(`/api/intakes/templates/${file}`);
      // The link works for the signed-in reader: the template's header names the format's columns.
      const body = await page.evaluate(async (url) => (await fetch(url)).text(), `/api/intakes/templates/${file}`);
      expect(body.split(/\r?\n/)[0]).toContain(firstColumn);
    }
    for (const [kind, caption] of [
      ['roster', 'Roster columns'],
      ['cases', 'Case list columns'],
    ] as const) {
      const table = page.getByRole('table', { name: caption });
      const names = await table.locator('tbody tr').evaluateAll((rows) => rows.map((r) => r.querySelector('code')?.textContent ?? ''));
      expect(names).toEqual(intakeColumns[kind].map((c) => c.name));
    }
    expect(await page.getByRole('table', { name: 'Roster columns' }).getByRole('row').filter({ hasText: 'hours' }).textContent()).toContain(
      'number 0 to 744, at most 2 decimals',
    );
    await page.close();
  });

  it('shows the administrator the set-up steps, each with its state and page', async () => {
    const page = await pageSignedInAs(h, 'admin@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/first-run`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { level: 1, name: 'First steps' }).waitFor();
    const steps = page.getByRole('list', { name: 'Set-up steps' }).getByRole('listitem');
    expect(await steps.count()).toBe(6);
    // The first step's state follows the data: to do without an active site, done with one.
    const first = steps.first();
    expect(await first.textContent()).toContain('Create the sites');
    const [{ active }] = (await h.ds.query(`SELECT count(*)::int AS active FROM sites WHERE retired_at IS NULL`)) as [{ active: number }];
    expect(await first.textContent()).toContain(active > 0 ? 'done' : 'to do');
    if (active === 0) {
      await h.ds.query(`INSERT INTO sites (code, name) VALUES ('FIRSTRUN', 'First-run test site')`);
      await page.reload({ waitUntil: 'networkidle' });
      await first.filter({ hasText: 'done' }).waitFor();
    }
    await first.getByRole('link', { name: 'Sites' }).click();
    await page.getByRole('heading', { level: 1, name: 'Sites' }).waitFor();
    await page.close();
  });
});
