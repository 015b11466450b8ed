import { describe, expect, it } from 'vitest';
import { provisionUser } from '../support/sign-in';
import { signInThroughPage, useBrowserApp } from '../support/browser-app';

/**
 * Each demo account signs in through the identity provider's page, lands on its role's page, sees
 * in the navigation what the role may use (and not what it may not), and signs out at both ends.
 * The roles come from provisionUser, not from the demo seed.
 */
const accounts = [
  {
    email: 'hygienist@demo.ratewarden.test',
    role: 'hygienist',
    landing: '/overview',
    heading: 'Overview',
    shows: ['Overview', 'Intakes', 'Runs', 'Exposure groups', 'Watch rules'],
    hides: ['Administration', 'Mailbox'],
  },
  {
    email: 'safety@demo.ratewarden.test',
    role: 'safety_manager',
    landing: '/flags',
    heading: 'Flags',
    shows: ['Flags', 'Watch rules', 'Trends', 'Runs'],
    hides: ['Intakes', 'Administration', 'Exposure groups'],
  },
  {
    email: 'physician@demo.ratewarden.test',
    role: 'physician',
    landing: '/flags',
    heading: 'Flags',
    shows: ['Flags', 'Overview', 'Group comparison', 'Intakes'],
    hides: ['Watch rules', 'Administration'],
  },
  {
    email: 'admin@demo.ratewarden.test',
    role: 'administrator',
    landing: '/admin',
    heading: 'Administration',
    shows: ['Administration', 'Mailbox'],
    hides: ['Overview', 'Flags', 'Intakes', 'Runs'],
  },
] as const;

describe('the four demo accounts in Chromium', () => {
  const h = useBrowserApp(async (ds) => {
    const [site] = (await ds.query(
      `INSERT INTO sites (code, name) VALUES ('DA' || substr(md5(random()::text), 1, 6), 'Demo-account test site') RETURNING id`,
    )) as Array<{ id: number }>;
    for (const a of accounts) await provisionUser(ds, a.email, a.role, a.role === 'administrator' ? [] : [site!.id]);
  });

  it.each(accounts)('$email signs in, lands on $landing with the navigation of the role, and signs out', async (a) => {
    const page = await h.browser.context.newPage();
    await signInThroughPage(page, h.app.baseUrl, a.email);
    await page.waitForURL(`${h.app.baseUrl}${a.landing}`);
    await page.getByRole('heading', { level: 1, name: a.heading }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    for (const label of a.shows) expect(await nav.getByRole('link', { name: label, exact: true }).count(), `${label} shown`).toBe(1);
    for (const label of a.hides) expect(await nav.getByRole('link', { name: label, exact: true }).count(), `${label} hidden`).toBe(0);

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(`${h.app.baseUrl}/`);
    await page.getByRole('link', { name: 'Sign in', exact: true }).waitFor();
    const session = await page.evaluate(async () => (await (await fetch('/api/session')).json()) as { user: unknown });
    expect(session.user).toBeNull();
    await page.close();
  });
});
