import { describe, expect, it } from 'vitest';
import { useBrowserApp } from '../support/browser-app';

describe('first page in Chromium', () => {
  const h = useBrowserApp();

  it('renders the product name, a sign-in link and Noto Sans served by the app itself', async () => {
    const page = await h.browser.context.newPage();
    const requested: string[] = [];
    page.on('request', (r) => requested.push(r.url()));
    await page.goto(h.app.baseUrl, { waitUntil: 'networkidle' });

    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Ratewarden');
    expect(await page.getByRole('link', { name: /sign in/i }).count()).toBeGreaterThan(0);

    const font = await page.evaluate(async () => {
      await document.fonts.ready;
      const h1 = document.querySelector('h1')!;
      return {
        family: getComputedStyle(h1).fontFamily,
        loaded: document.fonts.check('700 16px "Noto Sans"'),
        faces: [...document.fonts].filter((f) => f.family.replace(/"/g, '') === 'Noto Sans' && f.status === 'loaded').length,
      };
    });
    expect(font.family).toMatch(/^"?Noto Sans"?/);
    expect(font.loaded).toBe(true);
    expect(font.faces).toBeGreaterThan(0);
    expect(requested.some((u) => /\.woff2?$/.test(u))).toBe(true);
    // Nothing, fonts included, comes from anywhere but the app's own origin.
    expect(requested.filter((u) => !u.startsWith(h.app.baseUrl) && !u.startsWith('data:'))).toEqual([]);
    await page.close();
  });
});
