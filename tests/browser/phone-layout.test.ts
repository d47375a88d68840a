import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { curveCsv, HA_NM } from '../integration/submissions-fixtures';

const browser = browserForFile();
const phone = { viewport: { width: 390, height: 844 } };

describe('the places a phone used to trip over', () => {
  it('the upload zone lists each file once and stays small once files are in', async () => {
    const u = await makeUser();
    const page = await (await browser().newContext(phone)).newPage();
    await signInAs(page, u.email, u.password);
    await page.goto(`${BASE}/submit`);
    const zone = page.getByTestId('drop-zone');
    const empty = (await zone.boundingBox())!.height;
    expect(empty).toBeLessThan(140);
    const dir = mkdtempSync(path.join(tmpdir(), 'bandcone-phone-'));
    const files = ['phone-a-0deg.csv', 'phone-b-10deg.csv'].map((name, i) => {
      const p = path.join(dir, name);
      writeFileSync(p, curveCsv({ cwlNm: HA_NM - 2 * i, fwhmNm: 5, noiseSeed: i + 1 }));
      return p;
    });
    await page.getByTestId('file-input').setInputFiles(files);
    await page.waitForSelector('[data-testid=derived-numbers]', { timeout: 30_000 });
    for (const f of files) {
      const name = path.basename(f);
      // one card per file, and no other list of files anywhere on the page (the n_eff fit's table of angles aside)
      await expect(page.locator(`article[data-file="${name}"]`).count()).resolves.toBe(1);
      const elsewhere = await page.evaluate((n) => {
        const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
        let count = 0;
        for (let t = walker.nextNode(); t; t = walker.nextNode()) {
          if (t.textContent?.includes(n) && !t.parentElement?.closest('article[data-file], [data-testid="neff-panel"]')) count++;
        }
        return count;
      }, name);
      expect(elsewhere, name).toBe(0);
    }
    await expect(zone.textContent()).resolves.not.toContain('phone-a');
    expect((await zone.boundingBox())!.height).toBeLessThanOrEqual(empty);
    // a refused file is said in words beside the zone
    const bad = path.join(dir, 'picture.png');
    writeFileSync(bad, 'not a curve');
    await page.getByTestId('file-input').setInputFiles([bad]);
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'picture.png' }).count(), { timeout: 15_000 }).toBe(1);
    await screenshot(page, 'phone-upload-two-files');
  });

  it('the compare board’s optic select and the catalogue’s “acts like” header fit the screen', async () => {
    const board = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 8`);
    const page = await (await browser().newContext(phone)).newPage();
    await page.goto(`${BASE}/compare?curves=${board.map((c) => c.id).join(',')}`);
    const select = page.getByTestId('compare-optic');
    await select.waitFor();
    const box = (await select.boundingBox())!;
    expect(box.x).toBeGreaterThanOrEqual(0);
    expect(box.x + box.width).toBeLessThanOrEqual(390);

    await page.goto(`${BASE}/curves?line=Ha&fNumber=2&obstruction=0.3&sort=throughput`);
    await page.waitForSelector('[data-testid="results"] tbody tr');
    const header = page.locator('[data-testid="results"] thead abbr', { hasText: 'Acts like' });
    await expect(header.count()).resolves.toBe(1);
    // the whole word shows: its box is as wide as its text
    const clipped = await header.evaluate((el) => el.scrollWidth > el.clientWidth + 1 || /…$/.test(el.textContent ?? ''));
    expect(clipped).toBe(false);
  });
});
