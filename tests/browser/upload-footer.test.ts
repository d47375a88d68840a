import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';
import { makeUser } from '../support/users';
import { butterworthPoints, curveCsv, HA_NM } from '../integration/submissions-fixtures';
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
      await expect(page.locator('article').first().textContent()).resolves.toMatch(new RegExp(`line ${rows + 3}\\s*"End of data" is not a row of numbers`));
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

// One filter scanned at three angles, exported side by side with the angles in
// the header; generated with n_eff = 1.9, so the set's fitted effective index
// must come back as 1.9 (closed form CWL(θ) = CWL₀ √(1 − sin²θ/n²), docs/model.md §Angle shift).
describe('scans at several angles side by side', () => {
  it('are offered as a set and become one curve per angle, with the fitted effective index', async () => {
    const angles = [0, 12, 20];
    const scans = angles.map((a, k) => butterworthPoints({ cwlNm: HA_NM, fwhmNm: 3, aoiDeg: a, nEff: 1.9, noiseSeed: 300 + k }));
    const n = Math.max(...scans.map((s) => s.wavelengthNm.length));
    const lines = [angles.map((a) => `Wavelength ${a}deg (nm),T ${a}deg`).join(',')];
    for (let i = 0; i < n; i++) lines.push(scans.map((s) => (i < s.wavelengthNm.length ? `${s.wavelengthNm[i]},${s.transmission[i]}` : ',')).join(','));
    const file = path.join(dir, 'three-angles.csv');
    writeFileSync(file, lines.join('\n') + '\n');

    const page = await open(390);
    await page.locator('.uppy-Dashboard-input').first().setInputFiles([file]);
    await page.waitForSelector('[data-testid=derived-numbers]', { timeout: 30_000 });
    await expect(page.locator('#file-0-pair').count()).resolves.toBe(1);
    await page.getByRole('button', { name: 'Read each as one curve of a set' }).click();
    await page.waitForFunction(() => document.querySelectorAll('[data-testid=derived-numbers]').length >= 3, undefined, { timeout: 30_000 });
    await expect(page.getByTestId('aoi-input').evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value))).resolves.toEqual(['0', '12', '20']);
    await page.waitForFunction(() => !!document.querySelector('[data-testid=neff-value]'), undefined, { timeout: 30_000 });
    expect(Number(await page.getByTestId('neff-value').textContent())).toBeCloseTo(1.9, 1);
    await screenshot(page, 'upload-pairs-390');
    // what sticks out, named, so a failure says where
    const wide = await page.evaluate(() =>
      [...document.querySelectorAll('body *')]
        .filter((e) => e.getBoundingClientRect().right > document.documentElement.clientWidth + 1 && e.getBoundingClientRect().width > 0)
        .slice(-5)
        .map((e) => `${e.tagName.toLowerCase()}.${String((e as HTMLElement).className).slice(0, 60)} ${Math.round(e.getBoundingClientRect().right)}px`),
    );
    expect(wide).toEqual([]);
    await page.context().close();
  });
});
