import { chromium, type Browser, type Page } from 'playwright-core';
import { BASE, DEMO_PASSWORD } from './http';

// Debian's Chromium, never a downloaded browser.
export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
}

export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${BASE}/signin`);
  const form = page.getByRole('form', { name: 'Sign in with password' });
  await form.getByRole('textbox', { name: /E-mail/ }).fill(email);
  await form.locator('input[type="password"]').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
}

export async function screenshot(page: Page, name: string) {
  await page.screenshot({ path: `.data/screenshots/${name}.png`, fullPage: true });
}
