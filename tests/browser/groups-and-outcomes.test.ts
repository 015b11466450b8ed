import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';

/**
 * The hygienist's forms for exposure groups and outcomes (one form frame with the sites form:
 * web/src/components/form/record-form.tsx), by keyboard and pointer in Chromium: a bad value is
 * named beside its field and nothing is saved; a value the server refuses shows its problem; a
 * good one is saved; a change keeps the code that files carry.
 */
describe('the hygienist creates and changes exposure groups and outcomes', () => {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const h = useBrowserApp(async (ds) => {
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
  });

  it('checks, saves and changes a group, then an outcome that takes it as its reference group', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Exposure groups' }).click();
    await page.getByRole('heading', { level: 1, name: 'Exposure groups' }).waitFor();

    await page.getByRole('button', { name: 'New exposure group' }).click();
    const form = page.getByRole('form', { name: 'New exposure group' });
    await form.getByLabel('Code').fill(`WELD${tag}`);
    await form.getByLabel('Name').fill(`Welding bay ${tag}`);
    await form.getByLabel('Hazard').fill('welding fume');
    await form.getByLabel('Exposure level').fill('two');
    await form.getByLabel('Exposure level').press('Enter');
    await expect.poll(() => form.getByLabel('Exposure level').getAttribute('aria-invalid')).toBe('true');
    expect(await h.ds.query(`SELECT 1 FROM exposure_groups WHERE code = $1`, [`WELD${tag}`])).toHaveLength(0);

    await form.getByLabel('Exposure level').fill('2');
    await form.getByRole('button', { name: 'Create the group' }).click();
    await page.getByRole('button', { name: 'New exposure group' }).waitFor();
    const [group] = (await h.ds.query(`SELECT id, name, hazard, exposure_level FROM exposure_groups WHERE code = $1`, [`WELD${tag}`])) as Array<{
      id: number;
      name: string;
      hazard: string;
      exposure_level: number;
    }>;
    expect(group).toMatchObject({ name: `Welding bay ${tag}`, hazard: 'welding fume', exposure_level: 2 });

    // The same code again: the server refuses it, and the form says so without losing the entries.
    await page.getByRole('button', { name: 'New exposure group' }).click();
    await form.getByLabel('Code').fill(`WELD${tag}`);
    await form.getByLabel('Name').fill('A second welding bay');
    await form.getByLabel('Hazard').fill('welding fume');
    await form.getByRole('button', { name: 'Create the group' }).click();
    await form.getByText('Not saved').waitFor();
    expect(await form.getByLabel('Name').inputValue()).toBe('A second welding bay');
    await form.getByRole('button', { name: 'Cancel' }).click();

    await page.getByRole('button', { name: `Edit ${group!.name}` }).click();
    const change = page.getByRole('form', { name: `Change ${group!.name}` });
    expect(await change.getByLabel('Code').count()).toBe(0);
    await change.getByLabel('Name').fill(`Welding bay ${tag} (north)`);
    await change.getByRole('button', { name: 'Save the group' }).click();
    await change.waitFor({ state: 'detached' });
    const [changed] = (await h.ds.query(`SELECT code, name FROM exposure_groups WHERE id = $1`, [group!.id])) as Array<{ code: string; name: string }>;
    expect(changed).toEqual({ code: `WELD${tag}`, name: `Welding bay ${tag} (north)` });

    await nav.getByRole('link', { name: 'Outcomes' }).click();
    await page.getByRole('heading', { level: 1, name: 'Outcomes' }).waitFor();
    await page.getByRole('button', { name: 'New outcome' }).click();
    const outcome = page.getByRole('form', { name: 'New outcome' });
    await outcome.getByLabel('Code').fill(`MSD${tag}`);
    await outcome.getByLabel('Name').fill(`Upper-limb disorder ${tag}`);
    await outcome.getByLabel('Case definition').fill('Physician-confirmed upper-limb musculoskeletal disorder');
    await outcome.getByLabel('Counting').selectOption('recurrent');
    await outcome.getByLabel('Exposure lag (months)').fill('3');
    await outcome.getByLabel('Reference group').selectOption({ label: `Welding bay ${tag} (north)` });
    await outcome.getByRole('button', { name: 'Create the outcome' }).click();
    await page.getByRole('button', { name: 'New outcome' }).waitFor();
    const [stored] = (await h.ds.query(`SELECT counting_rule, lag_months, reference_group_id FROM outcomes WHERE code = $1`, [`MSD${tag}`])) as unknown[];
    expect(stored).toEqual({ counting_rule: 'recurrent', lag_months: 3, reference_group_id: group!.id });
  });
});
