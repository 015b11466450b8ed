import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';

/**
 * The administrator's people page in Chromium: give a provisioned person a role and sites, and
 * find the change still there after a reload. A safety manager and a person without a role get
 * no people page, and the server answers 403 to their requests for the admin API.
 */
describe('the administrator gives a person access in Chromium', () => {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const person = `person-${tag.toLowerCase()}@example.test`;
  const [siteA, siteB] = [`People site A ${tag}`, `People site B ${tag}`];
  let personId = '';

  const h = useBrowserApp(async (ds) => {
    const sites = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, $2), ($3, $4) RETURNING id`, [`PA${tag}`, siteA, `PB${tag}`, siteB])) as Array<{
      id: number;
    }>;
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [sites[0]!.id]);
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', null);
    personId = await provisionUser(ds, person, null);
  });

  it('changes the role and sites of a person, and the change is kept after a reload', async () => {
    const page = await pageSignedInAs(h, 'admin@demo.ratewarden.test');
    await page.waitForURL(`${h.app.baseUrl}/admin`);
    await page.getByRole('heading', { level: 1, name: 'Administration' }).waitFor();

    const row = page
      .getByRole('table', { name: /^People/ })
      .getByRole('row')
      .filter({ hasText: person });
    expect(await row.getByRole('cell').allTextContents()).toEqual(expect.arrayContaining(['no role', 'none', 'not signed in yet']));
    await row.getByRole('button', { name: `Change the access of ${person}` }).click();
    const form = page.getByRole('form', { name: `Access of ${person}` });
    await form.getByLabel('Role').selectOption({ label: 'Safety manager' });
    await form.getByLabel(siteA).check();
    await form.getByLabel(siteB).check();
    await form.getByLabel(siteA).uncheck();
    await form.getByRole('button', { name: 'Save access' }).click();
    await form.waitFor({ state: 'detached' });
    await row.getByRole('cell', { name: 'Safety manager', exact: true }).waitFor();
    expect(await row.getByRole('cell', { name: siteB, exact: true }).count()).toBe(1);

    await page.reload({ waitUntil: 'networkidle' });
    await row.getByRole('cell', { name: 'Safety manager', exact: true }).waitFor();
    expect(await row.getByRole('cell').allTextContents()).toEqual(expect.arrayContaining(['Safety manager', siteB]));
    expect(await row.textContent()).not.toContain(siteA);

    const [stored] = (await h.ds.query(
      `SELECT u.role, array(SELECT s.name FROM user_sites us JOIN sites s ON s.id = us.site_id WHERE us.user_id = u.id ORDER BY s.name) AS sites
       FROM users u WHERE u.id = $1`,
      [personId],
    )) as Array<{ role: string; sites: string[] }>;
    expect(stored).toEqual({ role: 'safety_manager', sites: [siteB] });
    await page.close();
  });

  it.each([
    { email: 'safety@demo.ratewarden.test', heading: 'Not part of your role' },
    { email: 'newcomer@demo.ratewarden.test', heading: 'No role yet' },
  ])('$email gets no people page, and the admin API answers 403', async ({ email, heading }) => {
    const page = await pageSignedInAs(h, email);
    await page.getByRole('heading', { level: 1 }).waitFor();
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Administration' }).count()).toBe(0);

    await page.goto(`${h.app.baseUrl}/admin`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: heading, exact: true }).waitFor();
    expect(await page.getByRole('table', { name: /^People/ }).count()).toBe(0);
    expect(await page.getByText(person).count()).toBe(0);

    // The page hides itself only as a courtesy; the server is what refuses.
    const answers = await page.evaluate(async (id) => {
      const { csrfToken } = (await (await fetch('/api/session')).json()) as { csrfToken: string };
      const list = await fetch('/api/admin/users');
      const change = await fetch(`/api/admin/users/${id}`, {
        method: 'PATCH',
        headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken },
        body: JSON.stringify({ role: 'administrator', siteIds: [] }),
      });
      return { list: list.status, change: change.status, code: ((await change.json()) as { code: string }).code };
    }, personId);
    expect(answers).toEqual({ list: 403, change: 403, code: 'forbidden' });
    const [stored] = (await h.ds.query(`SELECT role FROM users WHERE id = $1`, [personId])) as Array<{ role: string | null }>;
    expect(stored?.role).not.toBe('administrator');
    await page.close();
  });
});
