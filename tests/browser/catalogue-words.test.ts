import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserForFile, screenshot } from '../support/browser';
import { BASE } from '../support/http';
import { count } from '../support/db';
import { unitLeadSql } from '@/lib/catalogue/units';

const browser = browserForFile();

/** Waits until the page shows the answer to the address now in the bar. */
async function settled(page: Page, urlPart: RegExp) {
  await page.waitForURL(urlPart);
  await page.waitForFunction(() => !document.body.textContent?.includes('updating…') && !document.body.textContent?.includes('Searching…'));
}

async function noOverflow(page: Page, width: number) {
  expect(await page.evaluate(() => document.documentElement.scrollWidth), page.url()).toBeLessThanOrEqual(width);
}

// the catalogue lists one row per unit (a set's lead curve, lib/catalogue/units.ts), so counts are of leads
const verified = (where: string) => count('curves', `status = 'verified' AND ${where} AND ${unitLeadSql('curves')}`);

for (const width of [1440, 390]) {
  describe(`the catalogue reads what people type (${width} px)`, () => {
    it('words with numbers become removable chips; number fields take f/2, 80 % and 40, and say at the field what they cannot read', async () => {
      const context = await browser().newContext({ viewport: { width, height: 900 } });
      const page = await context.newPage();
      const errors: string[] = [];
      page.on('pageerror', (e) => errors.push(e.message));

      await page.goto(`${BASE}/curves`);
      await page.getByLabel('Search words').fill('H-alpha 5 nm');
      await page.getByRole('button', { name: 'Search', exact: true }).click();
      await settled(page, /q=H-alpha/);
      const expected = await verified(`'Ha' = ANY(lines) AND fwhm_nm BETWEEN 4 AND 6`);
      await expect.poll(() => page.getByTestId('result-count').textContent()).toContain(`${expected} unit`);
      await expect.poll(() => page.getByTestId('understood-line').textContent()).toContain('Hα');
      expect(await page.getByTestId('understood-width').textContent()).toContain('FWHM 4–6 nm');
      await noOverflow(page, width);
      await screenshot(page, `catalogue-words-${width}`);

      // removing the width chip takes "5 nm" out of the words
      await page.getByRole('button', { name: 'Remove FWHM 4–6 nm' }).click();
      await settled(page, /q=H-alpha(&|$)/);
      await expect.poll(() => page.getByTestId('result-count').textContent()).toContain(`${await verified(`'Ha' = ANY(lines)`)} unit`);

      // the filter fields: open them on a phone
      if (width < 1024) await page.getByRole('button', { name: /^Filters/ }).click();
      const field = (name: string) => page.locator(`[data-filter="fitness"] input[name="${name}"]`);
      await field('fNumber').fill('f/2');
      await field('fNumber').press('Enter');
      await settled(page, /fNumber=2(&|$)/);
      // with an optic the order is line throughput
      await expect.poll(() => page.getByRole('combobox', { name: 'Sort by' }).inputValue()).toBe('throughput');
      await field('obstruction').fill('40');
      await field('obstruction').press('Enter');
      await settled(page, /obstruction=0\.4(&|$)/);
      await field('minThroughput').fill('50 %');
      await field('minThroughput').press('Enter');
      await settled(page, /minThroughput=0\.5(&|$)/);

      // what cannot be read stays in the field with a message beside it, and the search does not change
      const before = page.url();
      await field('obstruction').fill('lots');
      await field('obstruction').press('Enter');
      await expect.poll(() => page.getByTestId('field-error-obstruction').textContent()).toContain('“lots” is not a number');
      expect(await field('obstruction').getAttribute('aria-invalid')).toBe('true');
      expect(page.url()).toBe(before);
      await field('obstruction').fill('95 %');
      await field('obstruction').press('Enter');
      await expect.poll(() => page.getByTestId('field-error-obstruction').textContent()).toMatch(/between 0 and 0.9/);
      await noOverflow(page, width);
      await screenshot(page, `catalogue-field-error-${width}`);
      expect(errors).toEqual([]);
      await context.close();
    });

    it('FWHM ranges tick together; an empty search offers the nearest answers with counts that hold', async () => {
      const context = await browser().newContext({ viewport: { width, height: 900 } });
      const page = await context.newPage();
      await page.goto(`${BASE}/curves`);
      if (width < 1024) await page.getByRole('button', { name: /^Filters/ }).click();
      // the boxes follow the address, which changes a moment after the click
      await page.getByTestId('fwhm-bucket-2-3').locator('input').click();
      await settled(page, /fwhmBucket=2-3/);
      await page.getByTestId('fwhm-bucket-3-4').locator('input').click();
      await settled(page, /fwhmBucket=2-3&fwhmBucket=3-4/);
      await expect.poll(() => page.getByTestId('fwhm-bucket-2-3').locator('input').isChecked()).toBe(true);
      expect(await page.getByTestId('fwhm-bucket-3-4').locator('input').isChecked()).toBe(true);
      await expect.poll(() => page.getByTestId('result-count').textContent()).toContain(`${await verified('fwhm_nm >= 2 AND fwhm_nm < 4')} unit`);
      await noOverflow(page, width);

      await page.goto(`${BASE}/curves?line=Ha&fNumber=2&obstruction=0.36&minThroughput=0.99`);
      const empty = page.getByTestId('empty-state');
      await expect.poll(() => empty.textContent()).toMatch(/the best is \d+(\.\d+)? % — show those/);
      expect(await page.getByTestId('best-throughput').textContent()).toMatch(/keeps \d+(\.\d+)? % of the line/);
      const told = Number((await page.getByTestId('relaxation-total').first().textContent())!.replace(/\D/g, ''));
      expect(told).toBeGreaterThan(0);
      await noOverflow(page, width);
      await screenshot(page, `catalogue-nearest-${width}`);
      await empty.getByRole('link', { name: /show those/ }).click();
      await settled(page, /minThroughput=0\.\d+/);
      await expect.poll(() => page.getByTestId('result-count').textContent()).toContain(`${told} unit`);
      await context.close();
    });
  });
}
