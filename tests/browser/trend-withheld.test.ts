import { describe, expect, it } from 'vitest';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { clearCohortData, makeCohort, settings, type Cohort } from '../integration/runs-fixture';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { allSiteIds } from '../support/test-db';

/**
 * The trends chart when a count is withheld: groups REF and EXP, 10 workers each over Oct–Dec
 * 2032; EXP has 6, 2 and 6 cases, REF 6 in each month. The hygienist may not see EXP's 2 in
 * November (nor the months the disclosure frame withholds with it), so that month is a gap with a
 * marker named in the legend and in words under the chart, and the 2 appears nowhere; the rate axis can switch to a log scale.
 */
/** The legend entry of web/src/components/charts/trend-chart.tsx (WITHHELD_LEGEND). */
const WITHHELD_LEGEND = 'withheld: a small count, or one it would reveal';

describe('a withheld point on the trends chart', () => {
  let c: Cohort;
  const h = useBrowserApp(async (ds) => {
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['DERM', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    const ids: Record<string, number[]> = { REF: [], EXP: [] };
    for (const g of ['REF', 'EXP'] as const) {
      for (let i = 0; i < 10; i++) {
        const w = await c.worker(`${g}${i}`, 1970 + i * 3, i % 2 ? 'F' : 'M');
        ids[g]!.push(w);
        for (const m of ['2032-10-01', '2032-11-01', '2032-12-01']) rows.push([w, m, c.sites[i % 2]!, c.groups[g]!, 160]);
      }
    }
    await c.roster(rows);
    const cases = (g: 'REF' | 'EXP', day: string, n: number) => ids[g]!.slice(0, n).map((w) => [w, c.outcomes.DERM!, day] as [number, number, string]);
    await c.cases([
      ...cases('REF', '2032-10-05', 6),
      ...cases('REF', '2032-11-05', 6),
      ...cases('REF', '2032-12-05', 6),
      ...cases('EXP', '2032-10-07', 6),
      ...cases('EXP', '2032-11-07', 2),
      ...cases('EXP', '2032-12-07', 6),
    ]);
    const run = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000', waitForLockMs: 60_000 });
    if (run.status !== 'succeeded') throw new Error(`the run did not succeed: ${JSON.stringify(run)}`);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
  });

  it('draws the withheld month as a gap with a legend entry, never the count, and offers a log scale', async () => {
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/trends?outcome=${c.outcomes.DERM}&window=month&span=0`, { waitUntil: 'networkidle' });
    const figure = page.getByRole('figure').first();
    await figure.locator('svg').first().waitFor();
    const svgText = (await figure.locator('svg text').allTextContents()).join(' | ');
    expect(svgText).toContain(WITHHELD_LEGEND);
    expect(await figure.textContent()).toMatch(
      /figures are withheld from you \(a count too small to show, or one that would reveal it\): [^.]*2032-11 \([^)]*Group EXP/,
    );
    await figure.getByRole('button', { name: 'Show as a table' }).click();
    const nov = figure.getByRole('row').filter({ hasText: '2032-11' }).filter({ hasText: 'Group EXP' });
    const cells = (await nov.getByRole('cell').allTextContents()).map((t) => t.trim());
    expect(['<5', 'withheld']).toContain(cells[1]);
    expect(cells).not.toContain('2');
    await figure.getByLabel('Log scale').check();
    await figure.locator('svg text', { hasText: '(log scale)' }).first().waitFor();
    await page.close();
  });
});
