// The API reference page at a phone's width and in the night view (docs/design.md
// §Responsive, §Night view): nothing wider than the screen, and no white or
// non-red colour anywhere once the night view is on.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launch, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe('the API reference page', () => {
  it('fits 390 px, jumps to a route from its index, and turns red on black at night', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(`${BASE}/docs/api`);
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toMatch(/Every route/);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await screenshot(page, 'api-reference-390');

    await page.getByRole('navigation', { name: 'Routes' }).getByRole('link', { name: /post \/api\/model\/cone/i }).click();
    await page.waitForURL(/#post-model-cone$/);
    await expect(page.locator('#post-model-cone').textContent()).resolves.toMatch(/Example request/);

    await page.locator('button[data-ready]', { hasText: 'Night view' }).click();
    await page.waitForFunction(() => document.documentElement.dataset.view === 'night');
    // Every text, background and border colour on the page is near-black or a red (R well above G and B).
    const offenders = await page.evaluate(() => {
      const bad: string[] = [];
      for (const el of Array.from(document.querySelectorAll('main *')).slice(0, 4000)) {
        const s = getComputedStyle(el);
        for (const c of [s.color, s.backgroundColor, s.borderTopColor]) {
          const [r, g, b, a] = (c.match(/[\d.]+/g) ?? []).map(Number);
          if (a === 0) continue;
          if (Math.max(r, g, b) > 24 && !(r > g + 60 && r > b + 60)) bad.push(`${el.tagName} ${c}`);
        }
      }
      return bad.slice(0, 5);
    });
    expect(offenders).toEqual([]);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await screenshot(page, 'api-reference-390-night');
    await context.close();
  });

  it('is linked from the API tokens page', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInAs(page, 'contributor@bandcone.test');
    await page.goto(`${BASE}/account/tokens`);
    await page.getByRole('link', { name: 'API reference' }).click();
    await page.waitForURL(/\/docs\/api$/);
    await context.close();
  });
});
