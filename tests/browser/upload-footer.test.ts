import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';
import { makeUser } from '../support/users';
import { curveCsv, HA_NM } from '../integration/submissions-fixtures';
import { closeSequelize } from '@/db/connection';

// A lab export that ends with a footer (common practice of instrument exports:
// an end marker, a point count, a checksum) is read without editing the file,
// the footer is named on the page, and "trailing lines to ignore" can be set.

let browser: Browser;
let dir: string;
let contributor: { id: string; email: string; password: string };

beforeAll(async () => {
  browser = await launch();
  contributor = await makeUser('contributor');
  dir = mkdtempSync(path.join(tmpdir(), 'bandcone-footer-'));
});
afterAll(async () => {
  await browser?.close();
  await closeSequelize();
});

async function open(width: number): Promise<Page> {
  const page = await (await browser.newContext({ viewport: { width, height: 900 } })).newPage();
  await signInAs(page, contributor.email, contributor.password);
  await page.goto(`${BASE}/submit`);
  await page.waitForSelector('.uppy-Dashboard-input', { state: 'attached' });
  return page;
}

describe('uploading a lab file with a footer', () => {
  for (const width of [1440, 390]) {
    it(`reads the data, names the footer and lets the trailing lines be set (${width} px)`, async () => {
      const file = path.join(dir, `footer-${width}.csv`);
      const body = curveCsv({ cwlNm: HA_NM, fwhmNm: 4, noiseSeed: width });
      const rows = body.trim().split('\n').length - 1;
      writeFileSync(file, `# exported by a bench spectrophotometer\n${body}End of data\nPoints,${rows}\nChecksum: 0x3F2A\n`);
      const page = await open(width);
      await page.locator('.uppy-Dashboard-input').first().setInputFiles([file]);
      await page.waitForSelector('[data-testid=derived-numbers]', { timeout: 30_000 });

      await expect(page.locator('#file-0-ftr').inputValue()).resolves.toBe('3');
      const skipped = page.getByTestId('file-0-skipped');
      await expect(skipped.textContent()).resolves.toMatch(/lines \d+–\d+ \(footer, “End of data”\)/);
      const cwl = parseFloat((await page.locator('[data-metric="CWL"]').first().textContent()) ?? '');
      expect(cwl).toBeCloseTo(HA_NM, 0);

      // with no trailing lines ignored, the footer is read as data and refused on its line
      await page.locator('#file-0-ftr').fill('0');
      await page.waitForFunction(() => /could not be read/.test(document.body.textContent ?? ''), undefined, { timeout: 30_000 });
      await expect(page.locator('body').textContent()).resolves.toMatch(new RegExp(`Line ${rows + 3}: "End of data" is not a row of numbers`));
      await page.locator('#file-0-ftr').fill('3');
      await page.waitForSelector('[data-testid=derived-numbers]', { timeout: 30_000 });
      await expect(page.locator('#file-0-ftr').inputValue()).resolves.toBe('3');

      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await screenshot(page, `upload-footer-${width}`);
      await page.context().close();
    });
  }
});
