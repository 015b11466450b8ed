import { readFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowserApp } from '../support/browser-app';

/** The displayed cells of a results row (the page prints 4 significant digits). */
async function cells(page: Page, table: RegExp, rowName: RegExp): Promise<string[]> {
  const row = page.getByRole('table', { name: table }).getByRole('row', { name: rowName });
  await row.waitFor({ timeout: 10_000 });
  return row.getByRole('cell').allTextContents();
}
const num = (s: string) => Number(s.replace(/,/g, '').replace('−', '-'));
/** Round as a report prints: to `places` decimals. */
const printed = (s: string, places: number) => num(s).toFixed(places);
/** The numbers in a text, in order ("95% CI 0.3840 to 0.5489" → [95, 0.384, 0.5489]). */
const numbers = (s: string) => [...s.matchAll(/-?\d[\d,]*\.?\d*/g)].map((m) => num(m[0]));

/** Opens the fold of other methods from the keyboard: focus its summary, press Enter. */
async function openFoldByKeyboard(page: Page, summary: RegExp): Promise<void> {
  const fold = page.locator('details', { has: page.locator('summary', { hasText: summary }) });
  await expect(fold.evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(false);
  await fold.locator('summary').focus();
  await page.keyboard.press('Enter');
  await expect(fold.evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(true);
}

const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/** axe-core's WCAG 2.1 A and AA rules on the page as it stands (Deque's axe-core): the violations' ids and places. */
async function axeViolations(page: Page): Promise<string[]> {
  await page.evaluate(axeSource);
  return page.evaluate(async () => {
    const w = window as unknown as { axe: { run: (ctx: Document, opts: unknown) => Promise<{ violations: { id: string; nodes: { target: string[] }[] }[] }> } };
    const r = await w.axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
    return r.violations.map(
      (v) =>
        `${v.id} at ${v.nodes
          .slice(0, 3)
          .map((n) => n.target.join(' '))
          .join('; ')}`,
    );
  });
}

describe('ad hoc comparison in Chromium', () => {
  const h = useBrowserApp();

  it('leads with the preferred rate-ratio method, its plot and reading, and folds the others; a published example end to end', async () => {
    const page = await h.browser.context.newPage();
    await page.goto(`${h.app.baseUrl}/ad-hoc`, { waitUntil: 'networkidle' });
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Ad hoc comparison');

    // Source: Feychting M, Osterlund B, Ahlbom A. Epidemiology 1998;9:490-494 — 136 cases in 22,050
    // person-years versus 1,709 in 127,650; worked in Rothman, Epidemiology: An Introduction; result as
    // printed in the epiR::epi.2by2 help page, example 5: IRR 0.46 (95% CI 0.38 to 0.55), rate
    // difference -7.22 (-8.43 to -6.00) per 1000 person-years.
    await page.getByLabel('Show rates', { exact: true }).selectOption('1000');
    await expect(page.getByLabel('Preferred rate-ratio interval', { exact: true }).inputValue()).resolves.toBe('exact');
    await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('136');
    await page.getByLabel('Exposed: person-years followed', { exact: true }).fill('22050');
    await page.getByLabel('Not exposed: cases with the outcome', { exact: true }).fill('1709');
    await page.getByLabel('Not exposed: person-years followed', { exact: true }).fill('127,650');
    await page.getByRole('button', { name: 'Compare the rates' }).click();

    // The lead: one measure, one method, its estimate, interval, plot and reading.
    const lead = page.getByRole('region', { name: /^Rate ratio, exposed over not exposed/ });
    await lead.waitFor({ timeout: 10_000 });
    expect(await lead.getByRole('heading', { level: 2 }).textContent()).toContain('by the preferred method: exact conditional');
    expect(printed((await lead.getByTestId('lead-estimate').textContent())!, 2)).toBe('0.46');
    const [, lower, upper] = numbers((await lead.getByTestId('lead-interval').textContent())!);
    expect([lower!.toFixed(2), upper!.toFixed(2)]).toEqual(['0.38', '0.55']);
    const plot = lead.getByRole('figure');
    expect(await plot.locator('figcaption').textContent()).toContain('Rate ratio with its 95% interval');
    expect(await plot.locator('svg').count()).toBe(1);
    const reading = await lead.getByRole('region', { name: 'What the numbers say' }).textContent();
    expect(reading).toContain('0.461 times the rate in the reference group');
    expect(reading).toContain('exact conditional');
    // The cautions stay beside the figures: association is not cause, small numbers give wide intervals.
    const cautions = await page.getByRole('complementary', { name: 'Cautions' }).textContent();
    expect(cautions).toMatch(/association in surveillance data is not proof of cause/i);
    expect(cautions).toMatch(/small numbers give wide intervals/i);
    expect(await page.getByRole('definition').allTextContents()).toContain('per 1,000 person-years');

    const ird = await cells(page, /^Other measures of the comparison/, /Rate difference per 1,000 person-years/);
    expect(printed(ird[0]!, 2)).toBe('-7.22');
    expect(printed(ird[2]!, 2)).toBe('-6.00');
    // The printed lower limit -8.43 is the truncation of -8.4359 (Wald; R 4.2.2 by hand, as recorded
    // beside the published example); at the page's three significant digits that is -8.44.
    expect(ird[1]).toBe('-8.44');

    // The other methods are folded away until opened, by keyboard.
    const methods = page.getByRole('table', { name: /^Rate ratio by each method/ });
    expect(await methods.isVisible()).toBe(false);
    await openFoldByKeyboard(page, /Other interval methods, compared/);
    expect(await methods.isVisible()).toBe(true);
    const wald = await cells(page, /^Rate ratio by each method/, /^Wald on the log scale/);
    expect([printed(wald[0]!, 2), printed(wald[1]!, 2), printed(wald[2]!, 2)]).toEqual(['0.46', '0.39', '0.55']);
    const exact = await cells(page, /^Rate ratio by each method/, /^exact conditional \(preferred\)/);
    expect([printed(exact[1]!, 2), printed(exact[2]!, 2)]).toEqual(['0.38', '0.55']);
    expect(
      await page
        .getByRole('table', { name: /^Rate ratio by each method/ })
        .getByRole('row', { name: /score \(test only\)/ })
        .count(),
    ).toBe(1);
    const note = await page.getByRole('region', { name: 'When the methods differ' }).textContent();
    expect(note).toContain('With these counts the methods agree closely');
    await page.close();
  });

  it('remembers the preferred method on this device and leads with it', async () => {
    const page = await h.browser.context.newPage();
    await page.goto(`${h.app.baseUrl}/ad-hoc`, { waitUntil: 'networkidle' });
    await page.getByLabel('Preferred rate-ratio interval', { exact: true }).selectOption('midP');
    await page.reload({ waitUntil: 'networkidle' });
    await expect(page.getByLabel('Preferred rate-ratio interval', { exact: true }).inputValue()).resolves.toBe('midP');
    // 3 versus 2 cases in equal person-time: small counts, where the methods part.
    await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('3');
    await page.getByLabel('Exposed: person-years followed', { exact: true }).fill('100');
    await page.getByLabel('Not exposed: cases with the outcome', { exact: true }).fill('2');
    await page.getByLabel('Not exposed: person-years followed', { exact: true }).fill('100');
    await page.getByRole('button', { name: 'Compare the rates' }).click();
    const lead = page.getByRole('region', { name: /^Rate ratio, exposed over not exposed/ });
    await lead.waitFor({ timeout: 10_000 });
    expect(await lead.getByRole('heading', { level: 2 }).textContent()).toContain('by the preferred method: mid-p exact');
    // Printing opens the fold, so the printed page carries every method.
    const fold = page.locator('details', { has: page.locator('summary', { hasText: 'Other interval methods, compared' }) });
    await expect(fold.evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(false);
    await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
    await expect(fold.evaluate((d) => (d as HTMLDetailsElement).open)).resolves.toBe(true);
    const note = await page.getByRole('region', { name: 'When the methods differ' }).textContent();
    expect(note).toContain('the methods part noticeably');
    expect(note).toContain('The smallest count here is 2');
    // Back to the default for the tests after this one (the browser profile is shared within the file).
    await page.getByLabel('Preferred rate-ratio interval', { exact: true }).selectOption('exact');
    await page.close();
  });

  it('takes a 2×2 table labelled by meaning and reproduces a published risk-difference interval', async () => {
    const page = await h.browser.context.newPage();
    await page.goto(`${h.app.baseUrl}/ad-hoc`, { waitUntil: 'networkidle' });
    await page.getByLabel(/2×2 table/).check();
    const form = page.getByRole('form', { name: 'Counts of people by exposure and outcome' });
    expect(await form.textContent()).not.toMatch(/\b[abcd]:/);
    // Source: Newcombe RG. Stat Med 1998;17:873-890, Table II, example (a): 56/70 versus 48/80;
    // method 10 (hybrid score) 0.0524 to 0.3339, method 6 (Miettinen–Nurminen) 0.0528 to 0.3382.
    // Entered by keyboard alone: Tab walks the table in reading order.
    await page.getByLabel('Exposed, with the outcome', { exact: true }).focus();
    for (const v of ['56', '14', '48', '32']) {
      await page.keyboard.type(v);
      await page.keyboard.press('Tab');
    }
    await expect(page.getByLabel('Exposed, without the outcome', { exact: true }).inputValue()).resolves.toBe('14');
    await expect(page.getByLabel('Not exposed, with the outcome', { exact: true }).inputValue()).resolves.toBe('48');
    await expect(page.getByLabel('Not exposed, without the outcome', { exact: true }).inputValue()).resolves.toBe('32');
    await page.keyboard.press('Enter');

    const lead = page.getByRole('region', { name: /^Risk difference, exposed minus not exposed/ });
    await lead.waitFor({ timeout: 10_000 });
    expect(await lead.getByRole('heading', { level: 2 }).textContent()).toContain('Newcombe hybrid score');
    // On screen, three significant digits in percentage points: 5.24 to 33.4.
    const [, lower, upper] = numbers((await lead.getByTestId('lead-interval').textContent())!);
    expect([lower, upper]).toEqual([Number((0.0524 * 100).toPrecision(3)), Number((0.3339 * 100).toPrecision(3))]);
    expect(await lead.getByRole('img').getAttribute('aria-label')).toContain('20 points');
    expect(await lead.getByRole('region', { name: 'What the numbers say' }).textContent()).toContain('Newcombe hybrid score');

    await openFoldByKeyboard(page, /Other interval methods and tests, compared/);
    const mn = await cells(page, /^Risk difference by each method/, /^Miettinen–Nurminen/);
    expect([mn[1], mn[2]]).toEqual(['0.0528', '0.338']);
    // The export keeps full precision: the published four decimals of both methods.
    const download = page.waitForEvent('download');
    await page
      .getByRole('table', { name: /^Risk difference by each method/ })
      .getByRole('button', { name: /^Export CSV/ })
      .click();
    const csv = await readFile((await (await download).path())!, 'utf8');
    const limits = (method: RegExp) => {
      const fields = csv
        .split('\r\n')
        .find((l) => method.test(l))!
        .split(',');
      return [Number(fields[2]).toFixed(4), Number(fields[3]).toFixed(4)];
    };
    expect(limits(/^Newcombe hybrid score \(preferred\)/)).toEqual(['0.0524', '0.3339']);
    expect(limits(/^Miettinen–Nurminen score/)).toEqual(['0.0528', '0.3382']);
    expect(
      await page
        .getByRole('table', { name: /^Tests of equal risks/ })
        .getByRole('row')
        .count(),
    ).toBe(4);
    await page.close();
  });

  it('says what is wrong with bad input, beside the field', async () => {
    const page = await h.browser.context.newPage();
    await page.goto(`${h.app.baseUrl}/ad-hoc`, { waitUntil: 'networkidle' });
    await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('2.5');
    await page.getByLabel('Exposed: person-years followed', { exact: true }).fill('-3');
    await page.getByLabel('Not exposed: cases with the outcome', { exact: true }).fill('');
    await page.getByLabel('Not exposed: person-years followed', { exact: true }).fill('abc');
    await page.getByRole('button', { name: 'Compare the rates' }).click();
    const exposedCases = page.getByLabel('Exposed: cases with the outcome', { exact: true });
    await expect(exposedCases.getAttribute('aria-invalid')).resolves.toBe('true');
    const description = await exposedCases.evaluate((el) => document.getElementById(el.getAttribute('aria-describedby')!)!.textContent);
    expect(description).toContain('The exposed cases must be a whole number.');
    const text = await page.locator('form').textContent();
    expect(text).toContain('The exposed person-time cannot be negative.');
    expect(text).toContain('Enter the reference cases.');
    expect(text).toContain('The reference person-time must be a number.');
    expect(await page.getByRole('region', { name: 'What the numbers say' }).count()).toBe(0);

    await page.getByLabel(/2×2 table/).check();
    await page.getByLabel('Exposed, with the outcome', { exact: true }).fill('0');
    await page.getByLabel('Exposed, without the outcome', { exact: true }).fill('0');
    await page.getByLabel('Not exposed, with the outcome', { exact: true }).fill('1.5');
    await page.getByRole('button', { name: 'Compare the risks' }).click();
    const form = page.getByRole('form', { name: 'Counts of people by exposure and outcome' });
    expect(await form.textContent()).toContain('The number not exposed, with the outcome must be a whole number.');
    expect(await form.textContent()).toContain('Enter the number not exposed, without the outcome.');
    await expect(page.getByLabel('Not exposed, with the outcome', { exact: true }).getAttribute('aria-invalid')).resolves.toBe('true');
    await page.getByLabel('Not exposed, with the outcome', { exact: true }).fill('1');
    await page.getByLabel('Not exposed, without the outcome', { exact: true }).fill('5');
    await page.getByRole('button', { name: 'Compare the risks' }).click();
    await form.getByText('The exposed group is empty: enter at least one person.').waitFor({ timeout: 10_000 });
    await expect(page.getByLabel('Exposed, without the outcome', { exact: true }).getAttribute('aria-invalid')).resolves.toBe('true');
    expect(await page.getByRole('region', { name: 'What the numbers say' }).count()).toBe(0);
    await page.close();
  });

  it('has no WCAG 2.1 A/AA violations with results and the fold open, wide and on a phone', async () => {
    for (const size of [
      { width: 1366, height: 768 },
      { width: 390, height: 844 },
    ]) {
      const page = await h.browser.context.newPage();
      await page.setViewportSize(size);
      await page.goto(`${h.app.baseUrl}/ad-hoc`, { waitUntil: 'networkidle' });
      await page.getByLabel('Exposed: cases with the outcome', { exact: true }).fill('3');
      await page.getByLabel('Exposed: person-years followed', { exact: true }).fill('100');
      await page.getByLabel('Not exposed: cases with the outcome', { exact: true }).fill('2');
      await page.getByLabel('Not exposed: person-years followed', { exact: true }).fill('100');
      await page.getByRole('button', { name: 'Compare the rates' }).click();
      await page.getByRole('region', { name: 'What the numbers say' }).waitFor({ timeout: 10_000 });
      await openFoldByKeyboard(page, /Other interval methods, compared/);
      expect(await axeViolations(page), `rates at ${size.width}px`).toEqual([]);
      await page.getByLabel(/2×2 table/).check();
      for (const [label, v] of [
        ['Exposed, with the outcome', '56'],
        ['Exposed, without the outcome', '14'],
        ['Not exposed, with the outcome', '48'],
        ['Not exposed, without the outcome', '32'],
      ] as const) {
        await page.getByLabel(label, { exact: true }).fill(v);
      }
      await page.getByRole('button', { name: 'Compare the risks' }).click();
      await page.getByRole('region', { name: /^Risk difference, exposed minus not exposed/ }).waitFor({ timeout: 10_000 });
      await openFoldByKeyboard(page, /Other interval methods and tests, compared/);
      expect(await axeViolations(page), `2×2 table at ${size.width}px`).toEqual([]);
      await page.close();
    }
  });
});
