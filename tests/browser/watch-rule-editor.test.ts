import { randomBytes } from 'node:crypto';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';

/**
 * The safety manager writes a watch rule in Chromium: the editor's fields are found by their
 * labels, bad numbers are refused beside their fields without losing what was typed, the saved
 * rule shows in the list, and a later edit is kept. The outcome and groups have names of their own.
 */
describe('the safety manager creates and edits a watch rule in Chromium', () => {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const outcome = `Outcome RE${tag}`;
  const group = `Group RE${tag} grinders`;
  const ruleName = `Grinders dermatitis ${tag}`;
  const recipient = `hse-${tag.toLowerCase()}@example.test`;

  const h = useBrowserApp(async (ds) => {
    const [site] = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Rule editor test site') RETURNING id`, [`RE${tag}`])) as Array<{ id: number }>;
    const groups = (await ds.query(
      `INSERT INTO exposure_groups (code, name, hazard, exposure_level) VALUES ($1, $2, 'none', 0), ($3, $4, 'metal fumes', 1) RETURNING id`,
      [`RR${tag}`, `Group RE${tag} office`, `RG${tag}`, group],
    )) as Array<{ id: number }>;
    await ds.query(
      `INSERT INTO outcomes (code, name, case_definition, counting_rule, lag_months, reference_group_id) VALUES ($1, $2, 'test', 'recurrent', 0, $3)`,
      [`RO${tag}`, outcome, groups[0]!.id],
    );
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [site!.id]);
  });

  const field = (page: Page, label: string) => page.getByRole('form', { name: 'Watch rule' }).getByLabel(label, { exact: true });
  /** The error the field's aria-describedby points at ('' when there is none). */
  const errorOf = (page: Page, label: string) =>
    field(page, label).evaluate((el) =>
      el.getAttribute('aria-invalid') === 'true'
        ? (el.getAttribute('aria-describedby') ?? '')
            .split(' ')
            .map((id) => document.getElementById(id)?.textContent ?? '')
            .join(' ')
        : '',
    );
  const storedRule = async () =>
    (await h.ds.query(`SELECT threshold, min_cases, window_kind, recipients, active FROM watch_rules WHERE name = $1`, [ruleName])) as Array<
      Record<string, unknown>
    >;

  it('refuses bad numbers without losing the input, saves the rule, lists it and keeps an edit', async () => {
    const page = await pageSignedInAs(h, 'safety@demo.ratewarden.test');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Watch rules' }).click();
    await page.getByRole('heading', { level: 1, name: 'Watch rules' }).waitFor();
    await page.getByRole('link', { name: 'New watch rule' }).click();
    await page.getByRole('heading', { level: 1, name: 'New watch rule' }).waitFor();

    await field(page, 'Name').fill(ruleName);
    await field(page, 'Outcome').selectOption({ label: outcome });
    await field(page, 'Exposure group').selectOption({ label: group });
    await field(page, 'Measure').selectOption({ label: 'Rate ratio (IRR) against the reference' });
    await field(page, 'Compare').selectOption({ label: 'The estimate' });
    await field(page, 'Threshold').fill('1.5x');
    await field(page, 'Minimum cases').fill('-2');
    await field(page, 'Recipients of threshold notices').fill(recipient);
    // Submitted from the keyboard: Enter in a text field.
    await field(page, 'Name').press('Enter');

    await page.waitForFunction(() => document.querySelectorAll('[aria-invalid="true"]').length >= 2);
    expect(await errorOf(page, 'Threshold')).toMatch(/number/);
    expect(await errorOf(page, 'Minimum cases')).toMatch(/at least 5: smaller counts are withheld/);
    expect(await errorOf(page, 'Name')).toBe('');
    expect(await field(page, 'Name').inputValue()).toBe(ruleName);
    expect(await field(page, 'Threshold').inputValue()).toBe('1.5x');
    expect(await field(page, 'Minimum cases').inputValue()).toBe('-2');
    expect(await field(page, 'Recipients of threshold notices').inputValue()).toBe(recipient);
    expect(await field(page, 'Outcome').evaluate((el: HTMLSelectElement) => el.selectedOptions[0]?.textContent)).toBe(outcome);
    expect(await field(page, 'Exposure group').evaluate((el: HTMLSelectElement) => el.selectedOptions[0]?.textContent)).toBe(group);
    expect(page.url()).toBe(`${h.app.baseUrl}/rules/new`);
    expect(await storedRule()).toEqual([]);

    await field(page, 'Threshold').fill('1.5');
    await field(page, 'Minimum cases').fill('6');
    await page.getByRole('button', { name: 'Create the rule' }).click();
    await page.getByRole('heading', { level: 1, name: 'Watch rules' }).waitFor();
    const row = page
      .getByRole('table', { name: /^Watch rules/ })
      .getByRole('row')
      .filter({ has: page.getByRole('link', { name: ruleName, exact: true }) });
    await row.waitFor();
    expect(await row.getByRole('cell').allTextContents()).toEqual(expect.arrayContaining([outcome, group, '1.5', 'active']));
    expect(await row.textContent()).toContain('at least 6 cases');
    expect(await storedRule()).toEqual([{ threshold: 1.5, min_cases: 6, window_kind: 'rolling12', recipients: [recipient], active: true }]);

    await row.getByRole('link', { name: ruleName, exact: true }).click();
    await page.getByRole('heading', { level: 1, name: ruleName }).waitFor();
    expect(await field(page, 'Threshold').inputValue()).toBe('1.5');
    await field(page, 'Threshold').fill('2');
    await field(page, 'Window').selectOption({ label: 'Single month' });
    await page.getByRole('form', { name: 'Watch rule' }).getByLabel('Active (checked after every run)').uncheck();
    await page.getByRole('button', { name: 'Save the rule' }).click();
    await page.getByRole('heading', { level: 1, name: 'Watch rules' }).waitFor();
    await row.getByRole('cell', { name: 'paused', exact: true }).waitFor();
    expect(await row.getByRole('cell').allTextContents()).toEqual(expect.arrayContaining(['2', 'paused']));
    expect(await row.textContent()).toContain('in a single month');

    // A fresh load reads the rule back from the server.
    await row.getByRole('link', { name: ruleName, exact: true }).click();
    await page.getByRole('heading', { level: 1, name: ruleName }).waitFor();
    await page.reload({ waitUntil: 'networkidle' });
    expect(await field(page, 'Threshold').inputValue()).toBe('2');
    expect(await field(page, 'Minimum cases').inputValue()).toBe('6');
    expect(await field(page, 'Window').inputValue()).toBe('month');
    expect(await page.getByRole('form', { name: 'Watch rule' }).getByLabel('Active (checked after every run)').isChecked()).toBe(false);
    expect(await storedRule()).toEqual([{ threshold: 2, min_cases: 6, window_kind: 'month', recipients: [recipient], active: false }]);
    await page.close();
  });
});
