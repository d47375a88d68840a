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

async function navLabels(email?: string) {
  const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  if (email) await signInAs(page, email);
  await page.goto(BASE + '/');
  const labels = await page.locator('nav[aria-label="Main"] a').allTextContents();
  await screenshot(page, `nav-${email?.split('@')[0] ?? 'visitor'}`);
  await context.close();
  return labels;
}

describe('each role sees its own navigation', () => {
  it('a visitor sees the public pages and a sign-in link', async () => {
    const labels = await navLabels();
    expect(labels).toEqual(['Catalogue', 'Cone study', 'Compare', 'Optics', 'Submit']);
  });
  it('a contributor also sees their account', async () => {
    expect(await navLabels('contributor@bandcone.test')).toEqual(['Catalogue', 'Cone study', 'Compare', 'Optics', 'Submit', 'Account']);
  });
  it('a moderator also sees the review queue', async () => {
    expect(await navLabels('moderator@bandcone.test')).toEqual(['Catalogue', 'Cone study', 'Compare', 'Optics', 'Submit', 'Review queue', 'Account']);
  });
  it('an admin sees administration too', async () => {
    expect(await navLabels('admin@bandcone.test')).toEqual(['Catalogue', 'Cone study', 'Compare', 'Optics', 'Submit', 'Review queue', 'Admin', 'Account']);
  });
  it('a contributor sent to an admin page is redirected to sign-in', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInAs(page, 'contributor@bandcone.test');
    await page.goto(BASE + '/admin/users');
    expect(new URL(page.url()).pathname).toBe('/signin');
    await expect(page.getByRole('alert').first().textContent()).resolves.toMatch(/role/);
    await context.close();
  });
  it('the night view turns the page to red on black and is remembered', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(BASE + '/');
    await page.locator('button[data-ready]', { hasText: 'Night view' }).click();
    await page.waitForFunction(() => document.documentElement.dataset.view === 'night');
    const bg = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
    expect(bg).toBe('rgb(0, 0, 0)');
    await page.reload();
    expect(await page.evaluate(() => document.documentElement.dataset.view)).toBe('night');
    const ink = await page.evaluate(() => getComputedStyle(document.querySelector('h1')!).color);
    const [r, g, b] = ink.match(/\d+/g)!.map(Number);
    expect(r).toBeGreaterThan(150);
    expect(g).toBeLessThan(100);
    expect(b).toBeLessThan(100);
    await screenshot(page, 'home-night');
    await context.close();
  });
});
