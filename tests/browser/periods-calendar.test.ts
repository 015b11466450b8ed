import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';

/**
 * The hygienist closes months on the reporting periods calendar in Chromium, by keyboard: a
 * complete month closes at once; a month whose case list is missing asks for a reason first. The
 * calendar then shows the new state in words beside its shape, and the store has the closures.
 */
describe('the hygienist closes a month on the calendar', () => {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const names = { a: `Alder works ${tag}`, b: `Birch yard ${tag}` };
  const ids = { a: 0, b: 0 };
  const h = useBrowserApp(async (ds) => {
    const sites = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, $2), ($3, $4) RETURNING id`, [
      `PA${tag}`,
      names.a,
      `PB${tag}`,
      names.b,
    ])) as Array<{ id: number }>;
    [ids.a, ids.b] = sites.map((s) => s.id) as [number, number];
    // Rosters of Sep and Oct 2026 at both sites; a case list of Alder works reporting through Oct, of Birch yard through Sep.
    const [roster] = (await ds.query(
      `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at) VALUES ('roster', 'applied', 'r.csv', $1, 1, $2, 'browser-test', now() - interval '1 day') RETURNING id`,
      [randomBytes(32).toString('hex'), [ids.a, ids.b]],
    )) as Array<{ id: string }>;
    await ds.query(
      `INSERT INTO roster_slices (site_id, month, intake_id) SELECT s, m, $1 FROM unnest($2::int[]) s, unnest(ARRAY['2026-09-01', '2026-10-01']::date[]) m`,
      [roster!.id, [ids.a, ids.b]],
    );
    for (const [site, through] of [
      [ids.a, '2026-10-01'],
      [ids.b, '2026-09-01'],
    ] as const) {
      await ds.query(
        `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at, reports_through, reports_site_ids) VALUES ('cases', 'applied', 'c.csv', $1, 1, $2, 'browser-test', now() - interval '1 day', $3, $2)`,
        [randomBytes(32).toString('hex'), [site], through],
      );
    }
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', [ids.a, ids.b]);
    // Requests other files left behind would change what the page says about the waiting run.
    await ds.query(`UPDATE run_requests SET picked_at = now() WHERE picked_at IS NULL`);
  });

  it('closes a complete month, and one with its case list missing after giving a reason', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Reporting periods' }).click();
    await page.getByRole('heading', { level: 1, name: 'Reporting periods' }).waitFor();
    const table = page.getByRole('table', { name: /^Sites × months/ });
    const row = (month: string) => table.getByRole('row').filter({ has: page.getByRole('rowheader', { name: month, exact: true }) });
    // Columns: the month, then the sites in name order (Alder works, Birch yard).
    const cells = async (month: string) => (await row(month).getByRole('cell').allTextContents()).map((t) => t.replace(/\s+/g, ' ').trim());
    expect(await cells('Oct 2026')).toEqual(
      ['Complete, openClose… ' + `${names.a}, Oct 2026`, 'Hours in, cases awaitedClose… ' + `${names.b}, Oct 2026`].map((t) => t.replace(/\s+/g, ' ')),
    );

    // Alder works, Oct 2026: complete, so it closes without a reason; all by keyboard.
    await page.getByRole('button', { name: `Close… ${names.a}, Oct 2026` }).focus();
    await page.keyboard.press('Enter');
    const form = page.getByRole('form', { name: `Close ${names.a}, Oct 2026` });
    await form.waitFor();
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe(`Close ${names.a}, Oct 2026`);
    await page.keyboard.press('Tab');
    await page.keyboard.type('checked with HR');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Enter');
    await page
      .getByRole('status')
      .filter({ hasText: `${names.a}, Oct 2026 is closed.` })
      .waitFor();
    await row('Oct 2026').getByRole('cell').first().filter({ hasText: 'Closed' }).waitFor();
    expect((await cells('Oct 2026'))[0]).toMatch(/^ClosedReopen… .*by .+, \d/);

    // Birch yard, Oct 2026: its case list is missing; the form asks why before closing.
    await page.getByRole('button', { name: `Close… ${names.b}, Oct 2026` }).click();
    const forced = page.getByRole('form', { name: `Close ${names.b}, Oct 2026` });
    expect(await forced.textContent()).toContain('No case list reports this month yet.');
    await forced.getByRole('button', { name: 'Close the month' }).click();
    await forced.getByRole('alert').filter({ hasText: 'Write a reason of a few words first.' }).waitFor();
    await forced.getByLabel('Reason').fill('the site did not work in October');
    await forced.getByRole('button', { name: 'Close the month' }).click();
    await page
      .getByRole('status')
      .filter({ hasText: `${names.b}, Oct 2026 is closed.` })
      .waitFor();
    await row('Oct 2026').getByRole('cell').nth(1).filter({ hasText: 'Closed' }).waitFor();

    const closures = (await h.ds.query(
      `SELECT site_id, to_char(month, 'YYYY-MM') AS month, action, reason FROM period_closures WHERE site_id = ANY($1) ORDER BY id`,
      [[ids.a, ids.b]],
    )) as Array<Record<string, unknown>>;
    expect(closures).toEqual([
      { site_id: ids.a, month: '2026-10', action: 'close', reason: 'checked with HR' },
      { site_id: ids.b, month: '2026-10', action: 'close', reason: 'the site did not work in October' },
    ]);
    // Each close asked for a run (it waits for uploads to settle), and the page says so.
    await page
      .getByRole('status')
      .filter({ hasText: /Run scheduled after uploads settle, at \d\d:\d\d/ })
      .waitFor();
    await page.close();
  });
});
