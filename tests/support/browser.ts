import { afterAll, afterEach, beforeAll } from 'vitest';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { BASE, DEMO_PASSWORD } from './http';
import { closeSequelize } from '@/db/connection';

// Every page any browser test opens is watched for Content-Security-Policy violations, which
// Chromium reports on the console (and pages report as `securitypolicyviolation` events); a
// test that caused one fails after it ends, naming what was refused.
const cspViolations: string[] = [];
const watched = new WeakSet<Page>();
const watchedContexts = new WeakSet<BrowserContext>();

export function isCspViolation(text: string): boolean {
  return text.includes('Content Security Policy') || text.includes('Content-Security-Policy') || text.startsWith('CSP violation:');
}

export function watchPage(page: Page) {
  if (watched.has(page)) return;
  watched.add(page);
  page.on('console', (msg) => {
    if (isCspViolation(msg.text())) cspViolations.push(`${page.url()}: ${msg.text()}`);
  });
}

function watchContext(context: BrowserContext) {
  if (watchedContexts.has(context)) return;
  watchedContexts.add(context);
  context.on('page', watchPage);
  for (const page of context.pages()) watchPage(page);
  // Runs before any page script and outside the page's policy.
  void context.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => {
      console.error(`CSP violation: ${e.violatedDirective} blocked ${e.blockedURI || 'inline'} at ${e.sourceFile}:${e.lineNumber}`);
    });
  });
}

/** The violations seen since the last call, emptied. */
export function takeCspViolations(): string[] {
  return cspViolations.splice(0);
}

afterEach(() => {
  const seen = takeCspViolations();
  if (seen.length) throw new Error(`The Content-Security-Policy refused something:\n${[...new Set(seen)].join('\n')}`);
});

/** One browser for a whole test file (launched before its first test, closed with the database connection after its last). */
export function browserForFile(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
    await closeSequelize();
  });
  return () => browser!;
}

// Debian's Chromium, never a downloaded browser.
export async function launch(): Promise<Browser> {
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  });
  const newContext = browser.newContext.bind(browser);
  browser.newContext = async (...args: Parameters<Browser['newContext']>) => {
    const context = await newContext(...args);
    watchContext(context);
    return context;
  };
  const newPage = browser.newPage.bind(browser);
  browser.newPage = async (...args: Parameters<Browser['newPage']>) => {
    const page = await newPage(...args);
    watchContext(page.context());
    watchPage(page);
    return page;
  };
  return browser;
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
