import { readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { browserForFile, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';

/**
 * Every page on disk, opened at 390 px (a common phone width) as the role it is for, must
 * not scroll sideways. A page added under app/ without a visit here fails the first test,
 * so no page escapes the check. Wide content (tables, charts) may scroll inside its own
 * box; the page itself may not.
 */

type Role = 'anonymous' | 'contributor' | 'moderator' | 'admin';
type Visit = { url: string; as: Role; ready?: string };

const root = path.resolve(import.meta.dirname, '../..');

/** "/curves/[id]" for app/(site)/curves/[id]/page.tsx; groups in brackets drop out. */
function pageRoutes(dir = path.join(root, 'app'), prefix = ''): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) {
      if (name === 'api') continue;
      const part = name.startsWith('(') && name.endsWith(')') ? '' : `/${name}`;
      out.push(...pageRoutes(p, prefix + part));
    } else if (name === 'page.tsx') out.push(prefix || '/');
  }
  return out;
}

const browser = browserForFile();
const contexts = new Map<Role, BrowserContext>();
type Ids = { curve: number; set?: number; board: number[]; waiting: number; mine: number };
let ids: Ids;

// A few URLs a page, as the role it is for, with the states that widen it most.
const VISITS: Record<string, (i: Ids) => Visit[]> = {
  '/': () => [{ url: '/', as: 'anonymous' }],
  '/curves': () => [
    { url: '/curves', as: 'anonymous', ready: '[data-testid="results"]' },
    // the fitness columns (line throughput, "acts like") on a fast optic
    { url: '/curves?line=Ha&fNumber=2&obstruction=0.3&sort=throughput', as: 'anonymous', ready: '[data-testid="results"]' },
  ],
  '/curves/[id]': (i) => [{ url: `/curves/${i.curve}`, as: 'anonymous' }, ...(i.set ? [{ url: `/curves/${i.set}`, as: 'anonymous' as const }] : [])],
  '/compare': (i) => [{ url: `/compare?curves=${i.board.join(',')}`, as: 'anonymous', ready: '[data-testid="compare-table"]' }, { url: '/compare', as: 'anonymous' }],
  '/study': (i) => [{ url: `/study?curve=${i.board.slice(0, 4).join(',')}`, as: 'anonymous' }, { url: '/study', as: 'anonymous' }],
  '/optics': () => [{ url: '/optics', as: 'contributor' }],
  '/docs/api': () => [{ url: '/docs/api', as: 'anonymous' }],
  '/submit': () => [{ url: '/submit', as: 'contributor' }],
  '/account': () => [{ url: '/account', as: 'contributor' }],
  '/account/tokens': () => [{ url: '/account/tokens', as: 'contributor' }],
  '/account/submissions/[id]': (i) => [{ url: `/account/submissions/${i.mine}`, as: 'contributor' }],
  '/confirm-email': () => [{ url: '/confirm-email', as: 'anonymous' }],
  '/register': () => [{ url: '/register', as: 'anonymous' }],
  '/reset-password': () => [{ url: '/reset-password', as: 'anonymous' }],
  '/reset-password/[token]': () => [{ url: '/reset-password/not-a-real-token-0123456789', as: 'anonymous' }],
  '/signin': () => [{ url: '/signin', as: 'anonymous' }],
  '/signin/check-mail': () => [{ url: '/signin/check-mail', as: 'anonymous' }],
  '/review': () => [{ url: '/review', as: 'moderator' }],
  '/review/[id]': (i) => [{ url: `/review/${i.waiting}`, as: 'moderator', ready: 'canvas' }],
  '/admin/users': () => [{ url: '/admin/users', as: 'admin', ready: '[data-testid="users-table"]' }, { url: '/admin/users?q=bandcone', as: 'admin' }],
  '/admin/audit': () => [{ url: '/admin/audit', as: 'admin', ready: '[data-testid="audit-table"]' }],
  '/admin/mail': () => [{ url: '/admin/mail', as: 'admin' }],
};

beforeAll(async () => {
  const [curve] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 1`);
  const board = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 8`);
  const [set] = await query<{ id: number }>(`SELECT min(id) AS id FROM curves WHERE status = 'verified' AND set_key IS NOT NULL GROUP BY set_key ORDER BY count(*) DESC LIMIT 1`);
  const [waiting] = await query<{ id: number }>(`SELECT id FROM submissions WHERE status = 'submitted' ORDER BY id LIMIT 1`);
  const [mine] = await query<{ id: number }>(`SELECT s.id FROM submissions s JOIN users u ON u.id = s.contributor_id WHERE u.email = 'contributor@bandcone.test' ORDER BY s.id LIMIT 1`);
  ids = { curve: curve.id, set: set?.id, board: board.map((c) => c.id), waiting: waiting.id, mine: mine.id };
  for (const role of ['anonymous', 'contributor', 'moderator', 'admin'] as const) {
    const context = await browser().newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 1 });
    if (role !== 'anonymous') {
      const page = await context.newPage();
      await signInAs(page, `${role}@bandcone.test`);
      await page.close();
    }
    contexts.set(role, context);
  }
});

/** How far the page scrolls sideways, and the elements reaching past the right edge. */
async function overflow(page: Page) {
  return page.evaluate(() => {
    const doc = document.documentElement;
    const width = doc.clientWidth;
    const culprits: string[] = [];
    for (const el of Array.from(document.body.querySelectorAll('*'))) {
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.right <= width + 0.5) continue;
      // inside a box that scrolls or clips on its own, it does not move the page
      let clipped = false;
      for (let p = el.parentElement; p && p !== document.body; p = p.parentElement) {
        const o = getComputedStyle(p).overflowX;
        if (o === 'auto' || o === 'scroll' || o === 'hidden' || o === 'clip') { clipped = true; break; }
      }
      if (!clipped) culprits.push(`${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}.${String(el.className).slice(0, 60)} right=${Math.round(r.right)}`);
    }
    return { by: doc.scrollWidth - width, culprits: culprits.slice(0, 5) };
  });
}

describe('every page fits a 390 px phone', () => {
  it('visits every page on disk', () => {
    const missing = pageRoutes().filter((r) => !VISITS[r]);
    expect(missing, 'pages with no 390 px visit in tests/browser/overflow.test.ts').toEqual([]);
  });

  it('the check itself sees a page 2 px too wide and names what sticks out', async () => {
    const page = await contexts.get('anonymous')!.newPage();
    await page.goto(BASE + '/signin');
    await page.evaluate(() => {
      const d = document.createElement('div');
      d.id = 'too-wide';
      d.style.width = `${document.documentElement.clientWidth + 2}px`;
      d.style.height = '1px';
      document.body.appendChild(d);
    });
    const o = await overflow(page);
    expect(o.by).toBe(2);
    expect(o.culprits.join()).toContain('div#too-wide');
    await page.close();
  });

  for (const route of Object.keys(VISITS)) {
    it(`${route} does not scroll sideways, by day or at night`, async () => {
      const failures: string[] = [];
      for (const v of VISITS[route](ids)) {
        const page = await contexts.get(v.as)!.newPage();
        const errors: string[] = [];
        page.on('pageerror', (e) => errors.push(e.message));
        const res = await page.goto(BASE + v.url, { waitUntil: 'load' });
        expect(res?.status(), v.url).toBeLessThan(500);
        if (!v.url.startsWith('/signin')) expect(new URL(page.url()).pathname, `${v.url} sent ${v.as} to sign in`).not.toBe('/signin');
        if (v.ready) await page.waitForSelector(v.ready, { timeout: 20_000 }).catch(() => failures.push(`${v.url}: ${v.ready} never appeared`));
        // let client charts and late layout settle
        await page.waitForTimeout(500);
        for (const view of ['day', 'night'] as const) {
          if (view === 'night') await page.evaluate(() => { document.documentElement.dataset.view = 'night'; });
          const o = await overflow(page);
          if (o.by > 0) failures.push(`${v.url} (${v.as}, ${view}) scrolls ${o.by} px sideways: ${o.culprits.join('; ')}`);
        }
        await screenshot(page, `phone-${v.url.replace(/[^a-z0-9]+/gi, '-').replace(/^-|-$/g, '') || 'home'}`);
        if (errors.length) failures.push(`${v.url}: script error ${errors[0]}`);
        await page.close();
      }
      expect(failures).toEqual([]);
    });
  }
});
