import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, screenshot } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';
import { GRID_ERROR } from '@/lib/catalogue/grid-accuracy';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeSequelize();
});

async function rows(page: Page) {
  return page.locator('[data-testid="results"] tbody tr').count();
}

/** Waits until the table shows the answer to the URL now in the address bar. */
async function settled(page: Page, urlPart: RegExp) {
  await page.waitForURL(urlPart);
  await page.waitForFunction(() => !document.querySelector('[data-testid="results"]')?.closest('[aria-busy="true"]') && !document.body.textContent?.includes('updating…'));
}

async function raws(page: Page, testId: string): Promise<number[]> {
  return page.locator(`[data-testid="${testId}"]`).evaluateAll((els) => els.map((e) => Number(e.getAttribute('data-raw'))));
}

describe('the catalogue in a browser', () => {
  it('searches by a word, narrows by FWHM and by fitness for an optic, opens a result, compares three and downloads a CSV that reads back', async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 }, acceptDownloads: true });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));

    // 1. a word
    await page.goto(`${BASE}/curves`);
    await page.getByLabel('Search words').fill('hydrogen alpha');
    await page.getByRole('button', { name: 'Search', exact: true }).click();
    await settled(page, /q=hydrogen/);
    // one row per physical unit: a set measured at several angles counts once
    const [{ n: haCount }] = await query<{ n: string }>(
      `SELECT count(DISTINCT coalesce(set_key || '|' || revision, 'c' || id)) AS n FROM curves WHERE status = 'verified' AND 'Ha' = ANY(lines)`,
    );
    await expect.poll(() => page.getByTestId('result-count').textContent()).toContain(`${Number(haCount)} units`);
    await screenshot(page, 'catalogue-search-1440');

    // 2. narrow by FWHM: at most 5 nm
    const fwhmTo = page.locator('[data-filter="fwhm"] input[name="fwhmMax"]');
    await fwhmTo.fill('5');
    await fwhmTo.press('Enter');
    await settled(page, /fwhmMax=5/);
    const fwhms = await raws(page, 'fwhm');
    expect(fwhms.length).toBeGreaterThan(0);
    expect(fwhms.every((f) => f <= 5)).toBe(true);

    // 3. fitness for an example optic, keeping at least 50 % of Hα
    const [astrograph] = await query<{ id: number; f_number: number; obstruction: number }>(
      `SELECT id, f_number, obstruction FROM optics WHERE is_example AND obstruction BETWEEN 0.35 AND 0.4 ORDER BY f_number LIMIT 1`,
    );
    await page.locator('#optic-pick').selectOption(String(astrograph.id));
    await settled(page, new RegExp(`fNumber=${astrograph.f_number}`));
    const minField = page.locator('[data-filter="fitness"] input[name="minThroughput"]');
    await minField.fill('50');
    await minField.press('Enter');
    await settled(page, /minThroughput=0\.5/);
    await page.getByRole('combobox', { name: 'Sort by' }).selectOption('throughput');
    await settled(page, /sort=throughput/);
    const taus = await raws(page, 'throughput');
    expect(taus.length).toBeGreaterThan(0);
    expect(taus.every((t) => t >= 0.5 - GRID_ERROR.max)).toBe(true);
    expect(await page.getByTestId('solar-caution').count()).toBe(1);
    await screenshot(page, 'catalogue-fitness-1440');

    // 4. open a result
    const firstLink = page.getByTestId('result-link').first();
    const title = (await firstLink.textContent())!.trim();
    await firstLink.click();
    await page.waitForURL(/\/curves\/\d+$/);
    await expect.poll(() => page.locator('h1').textContent()).toBe(title);
    expect(await page.getByTestId('citation').textContent()).toMatch(/Bandcone curve \d+/);
    expect(await page.getByTestId('run-study').getAttribute('href')).toMatch(/^\/study\?curve=\d+$/);
    const curveId = Number(new URL(page.url()).pathname.split('/').pop());

    // the cone-averaged overlay for the chosen optic
    await page.getByTestId('overlay-toggle').check();
    await expect.poll(() => page.getByTestId('cone-result').textContent(), { timeout: 20_000 }).toMatch(/keeps \d+\.\d %/);
    await screenshot(page, 'catalogue-curve-1440');

    // 6. download its CSV and read it back through the upload reader
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('download-csv').click()]);
    const csv = await readFile((await download.path())!, 'utf8');
    const form = new FormData();
    form.append('file', new Blob([csv], { type: 'text/csv' }), download.suggestedFilename());
    const preview = (await (await fetch(`${BASE}/api/curves/preview`, { method: 'POST', body: form })).json()) as { points: { wavelengthNm: number[]; transmission: number[] } };
    const stored = (await (await fetch(`${BASE}/api/curves/${curveId}/points`)).json()) as { wavelengthNm: number[]; transmission: number[] };
    expect(preview.points).toEqual(stored);

    // 5. three curves onto the compare board from the results
    await page.goBack();
    await settled(page, /sort=throughput/);
    expect(await rows(page)).toBeGreaterThanOrEqual(3);
    const boxes = page.locator('[data-testid="results"] tbody input[type="checkbox"]');
    // the exact throughput the search showed for the first result, which the board must repeat for the same optic
    const firstTau = (await page.getByTestId('throughput').first().textContent())!.trim();
    expect(firstTau).toMatch(/\d+\.\d %/);
    const picked: number[] = [];
    for (let k = 0; k < 3; k++) {
      await boxes.nth(k).check();
      picked.push(Number((await boxes.nth(k).getAttribute('data-testid'))!.replace('compare-', '')));
    }
    await expect.poll(() => page.getByTestId('compare-tray').textContent()).toContain('3 of 8');
    await page.getByTestId('open-compare').click();
    await page.waitForURL(/\/compare\?curves=/);
    expect(new URL(page.url()).searchParams.get('curves')).toBe(picked.join(','));
    await expect.poll(() => page.locator('[data-testid="compare-table"] thead th').count()).toBe(4);
    // the board starts on the optic of the search it came from
    expect(new URL(page.url()).searchParams.get('fNumber')).toBe(String(astrograph.f_number));
    expect(await page.getByTestId('compare-optic').inputValue()).toBe('search');
    expect(await page.locator('[data-testid="compare-optic"] option:checked').textContent()).toContain(`f/${astrograph.f_number.toFixed(1)}, ${astrograph.obstruction.toFixed(2)}`);
    await expect.poll(() => page.getByTestId(`compare-throughput-${picked[0]}`).textContent(), { timeout: 20_000 }).toContain(firstTau);
    await screenshot(page, 'catalogue-compare-1440');

    // the same pages on a phone
    await page.setViewportSize({ width: 390, height: 844 });
    await screenshot(page, 'catalogue-compare-390');
    await page.goto(`${BASE}/curves?q=hydrogen+alpha&fwhmMax=5`);
    await screenshot(page, 'catalogue-search-390');
    await page.goto(`${BASE}/curves/${curveId}`);
    await screenshot(page, 'catalogue-curve-390');

    expect(errors).toEqual([]);
    await context.close();
  });

  it('tells the reader what to loosen when nothing matches', async () => {
    const page = await browser.newPage();
    await page.goto(`${BASE}/curves?line=Ha&fwhmMax=0.5`);
    const empty = page.getByTestId('empty-state');
    await expect.poll(() => empty.textContent()).toMatch(/any FWHM/);
    await empty.getByRole('link', { name: 'any FWHM' }).click();
    await page.waitForURL((u) => !u.search.includes('fwhmMax'));
    await expect.poll(() => rows(page)).toBeGreaterThan(0);
    await page.close();
  });
});
