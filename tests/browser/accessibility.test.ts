import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { pageSignedInAs, useBrowserApp } from '../support/browser-app';
import { makeFlagFixture, type FlagFixture } from './flag-fixture';
import { allSiteIds } from '../support/test-db';
import { plantAudiograms } from './audiogram-fixture';

const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: Array<{ target: string[] }>;
}

/** Runs axe-core (WCAG 2.1 A and AA rules) on the page as it stands; returns the violations found. */
async function axe(page: Page): Promise<AxeViolation[]> {
  // Evaluated through the DevTools protocol: the app's Content-Security-Policy (script-src 'self') rightly refuses a script tag.
  await page.evaluate(axeSource);
  return page.evaluate(async () => {
    const w = window as unknown as { axe: { run: (ctx: Document, opts: unknown) => Promise<{ violations: AxeViolation[] }> } };
    const r = await w.axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => ({ target: n.target })) }));
  });
}

/**
 * Every main page, signed in as the hygienist (who sees most of them) on the flag fixture's data,
 * checked by axe-core against the WCAG 2.1 A and AA rules it automates (Deque's axe-core; the
 * rules it cannot automate, such as meaningful reading order, are left to review).
 */
describe('pages pass the automated WCAG 2.1 A and AA checks', () => {
  let fx: FlagFixture;
  let hearingWorker = '';
  let noticeId: string;
  const h = useBrowserApp(async (ds) => {
    fx = await makeFlagFixture(ds);
    const allSites = await allSiteIds(ds);
    hearingWorker = await plantAudiograms(ds, allSites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', allSites);
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    // The physician may have been provisioned after the fixture's run: a notice of its flag addressed to them, for the inbox pages.
    noticeId = (
      (await ds.query(
        `INSERT INTO notices (flag_id, flag_event_id, recipient, subject, body, kind, period, completeness)
       SELECT e.flag_id, e.id, 'physician@demo.ratewarden.test', 'Ratewarden: watch rule raised a flag', 'A watch rule in Ratewarden has been crossed.', 'raised', f.period, 'complete'
       FROM flag_events e JOIN flags f ON f.id = e.flag_id WHERE e.flag_id = $1 AND e.kind = 'raised'
       ON CONFLICT (flag_event_id, recipient) DO UPDATE SET read_at = NULL RETURNING id`,
        [fx.flagId],
      )) as Array<{ id: string }>
    )[0]!.id;
  });

  /** Signs `email` in and checks each path; returns what axe found, page by page. */
  const check = async (email: string, paths: string[], viewport?: { width: number; height: number }) => {
    const page = await pageSignedInAs(h, email);
    if (viewport) await page.setViewportSize(viewport);
    const found: string[] = [];
    for (const path of paths) {
      await page.goto(`${h.app.baseUrl}${path}`, { waitUntil: 'networkidle' });
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      for (const v of await axe(page))
        found.push(
          `${path}: ${v.id} (${v.impact}) ${v.help} at ${v.nodes
            .slice(0, 3)
            .map((n) => n.target.join(' '))
            .join('; ')}`,
        );
    }
    await page.close();
    return found;
  };

  const pages = (flagId: string, outcome: number) => [
    '/overview',
    `/trends?outcome=${outcome}`,
    `/comparison?outcome=${outcome}&window=month&period=2032-12-01`,
    `/adjusted?outcome=${outcome}&window=month&period=2032-12-01&stratify=sex`,
    '/flags',
    `/flags/${flagId}`,
    '/rules',
    '/rules/new',
    '/intakes',
    '/runs',
    '/periods',
    '/groups',
    '/outcomes',
    '/ad-hoc',
    '/hearing/upload',
    `/sir?outcomeId=${outcome}`,
    '/settings',
  ];

  it('as the hygienist, on every page', async () => {
    expect(await check('hygienist@demo.ratewarden.test', pages(fx.flagId, fx.cohort.outcomes.DERM!))).toEqual([]);
  });

  it('as the physician, on the unattributed cases, the intakes they read, the audiograms, the case register, a case and the notices inbox', async () => {
    expect(
      await check('physician@demo.ratewarden.test', [
        '/runs/unattributed',
        '/runs',
        '/intakes',
        '/hearing',
        `/hearing/workers/${hearingWorker}`,
        '/cases',
        `/cases/${fx.caseRefs[0]}`,
        '/notices',
        `/notices/${noticeId}`,
      ]),
    ).toEqual([]);
  });

  it('as the safety manager on a flag with its review form, and as the administrator', async () => {
    expect(await check('safety@demo.ratewarden.test', [`/flags/${fx.flagId}`, '/sir'])).toEqual([]);
    expect(await check('admin@demo.ratewarden.test', ['/admin', '/admin/clients', '/admin/audit', '/mailbox', '/settings', '/sites', '/first-run'])).toEqual(
      [],
    );
  });

  it('at phone size (390×844), every page of the hygienist and the administrator, and the opened menu', async () => {
    const phone = { width: 390, height: 844 };
    expect(await check('hygienist@demo.ratewarden.test', pages(fx.flagId, fx.cohort.outcomes.DERM!), phone)).toEqual([]);
    expect(
      await check('admin@demo.ratewarden.test', ['/admin', '/admin/clients', '/admin/audit', '/mailbox', '/settings', '/sites', '/first-run'], phone),
    ).toEqual([]);
    const page = await pageSignedInAs(h, 'hygienist@demo.ratewarden.test');
    await page.setViewportSize(phone);
    await page.goto(`${h.app.baseUrl}/overview`, { waitUntil: 'networkidle' });
    // The navigation collapses behind the Menu button on a phone and opens on request.
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
    await page.getByRole('button', { name: 'Menu' }).click();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Trends' }).waitFor();
    const found = (await axe(page)).map((v) => `${v.id} ${v.help}`);
    expect(found).toEqual([]);
    await page.close();
  });

  it('as the physician, on the flag with its cases', async () => {
    const page = await pageSignedInAs(h, 'physician@demo.ratewarden.test');
    await page.goto(`${h.app.baseUrl}/flags/${fx.flagId}`, { waitUntil: 'networkidle' });
    await page.getByRole('heading', { name: 'Cases behind this flag' }).waitFor();
    const found = (await axe(page)).map(
      (v) =>
        `${v.id} (${v.impact}) ${v.help} at ${v.nodes
          .slice(0, 3)
          .map((n) => n.target.join(' '))
          .join('; ')}`,
    );
    expect(found).toEqual([]);
    // The check itself works: an image without a text alternative and an unlabelled field are found.
    await page.evaluate(() => document.querySelector('main')!.insertAdjacentHTML('beforeend', '<img src="/planted.png"><input type="text">'));
    expect((await axe(page)).map((v) => v.id)).toEqual(expect.arrayContaining(['image-alt', 'label']));
    await page.close();
  });
});
