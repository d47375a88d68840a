import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launch, signInAs, takeCspViolations } from '../support/browser';
import { BASE } from '../support/http';

// The policy itself (lib/http/security-headers.ts) in a real Chromium: our pages run under it
// without a single refusal (tests/support/browser.ts fails any browser test that causes one),
// and what it exists to stop is stopped — and noticed by that watcher.
let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe('the Content-Security-Policy in Chromium', () => {
  it('refuses an injected inline handler, and the browser tests notice', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(`${BASE}/curves`);
    await page.evaluate(() => {
      document.body.insertAdjacentHTML('beforeend', '<button id="injected" onclick="window.__injected = 1">x</button>');
    });
    await page.click('#injected');
    await page.waitForTimeout(300);
    expect(await page.evaluate(() => (window as unknown as { __injected?: number }).__injected)).toBeUndefined();
    const seen = takeCspViolations();
    expect(seen.join('\n')).toMatch(/script-src/);
    await context.close();
  });

  it('another site cannot frame a page (frame-ancestors)', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    // A document of another origin (about:blank here) framing the review queue.
    await page.setContent(`<iframe id="f" src="${BASE}/signin" width="400" height="300"></iframe>`);
    await page.waitForTimeout(1500);
    const frame = page.frames().find((f) => f !== page.mainFrame());
    const framedText = frame ? await frame.evaluate(() => document.body?.innerText ?? '').catch(() => '') : '';
    expect(framedText).not.toMatch(/Sign in/);
    takeCspViolations(); // the refusal to frame is the expected outcome here
    await context.close();
  });

  it('the cone study computes in its web worker and draws its charts under the policy', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const workers: string[] = [];
    page.on('worker', (w) => workers.push(w.url()));
    await signInAs(page, 'contributor@bandcone.test');
    await page.goto(`${BASE}/study`);
    await page.waitForFunction(() => document.querySelectorAll('canvas').length > 0, undefined, { timeout: 30_000 });
    await page.waitForTimeout(1500);
    expect(workers.length).toBeGreaterThan(0);
    // ECharts drew something: a canvas with non-blank pixels.
    const drawn = await page.evaluate(() => [...document.querySelectorAll('canvas')].some((c) => {
      const ctx = (c as HTMLCanvasElement).getContext('2d');
      if (!ctx || !c.width || !c.height) return false;
      const data = ctx.getImageData(0, 0, c.width, c.height).data;
      for (let i = 3; i < data.length; i += 4 * 97) if (data[i] !== 0) return true;
      return false;
    }));
    expect(drawn).toBe(true);
    await context.close();
  });
});
