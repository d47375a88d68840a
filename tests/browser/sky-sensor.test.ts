import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launch, screenshot } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';
import { fieldMap } from '@/lib/engine/field-map';
import { SPEED_OF_LIGHT_KMS } from '@/lib/engine/lines';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
  await closeSequelize();
});

const pct = (f: number) => `${(Math.round(f * 1000) / 10).toFixed(1)} %`;

describe('the study page: whole sensor, sky and target', () => {
  for (const width of [1440, 390]) {
    it(`shows the sensor map, the sky table and the target picker at ${width} px`, async () => {
      const [curve] = await query<{ id: number; w: number[]; t: number[]; n_eff: number | null }>(
        `SELECT id, wavelength_nm AS w, transmission AS t, n_eff FROM curves WHERE status = 'verified' AND 'Ha' = ANY(lines) AND aoi_deg = 0 AND set_key IS NULL ORDER BY id LIMIT 1`,
      );
      const context = await browser.newContext({ viewport: { width, height: 1000 } });
      const page = await context.newPage();
      await page.goto(`${BASE}/study?curve=${curve.id}&f=2.5&obs=0.36&n=2.05&line=Ha`);
      const map = page.getByTestId('sensor-map');
      await map.waitFor({ timeout: 30_000 });
      await page.locator('#sm-mode').selectOption('exitPupil');
      await page.locator('#sm-pupil').fill('45');
      // the corner figure equals the engine's own field map for the same inputs
      const expected = fieldMap({
        points: { wavelengthNm: curve.w, transmission: curve.t },
        optic: { fNumber: 2.5, obstruction: 0.36 },
        sensor: { widthMm: 23.5, heightMm: 15.6 },
        chiefRay: { exitPupilMm: 45 },
        nEff: 2.05,
        lineNm: 656.28,
      });
      await expect.poll(() => map.getByTestId('sensor-map-figures').textContent(), { timeout: 20_000 }).toContain(pct(expected.corner));
      await expect(map.getByTestId('sensor-map-figures').textContent()).resolves.toContain(pct(expected.centre));

      const sky = page.getByTestId('sky-panel');
      await expect.poll(() => sky.getByTestId('sky-table').count(), { timeout: 20_000 }).toBe(1);
      await expect(sky.getByTestId('sky-table').textContent()).resolves.toMatch(/Na D2 589\.0 nm/);
      await expect(sky.getByTestId('sky-gain').first().textContent()).resolves.toMatch(/× \d/);

      if (width === 1440) {
        await page.locator('#study-target').selectOption('M51');
        await expect.poll(() => page.locator('#study-v').inputValue()).toBe(String(Math.round(0.001544 * SPEED_OF_LIGHT_KMS * 10) / 10));
      }
      await screenshot(page, `study-sky-sensor-${width}`);
      await map.screenshot({ path: `.data/screenshots/sensor-map-${width}.png` });
      await sky.screenshot({ path: `.data/screenshots/sky-panel-${width}.png` });
      // nothing spills sideways at 390 px
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(1);
      await context.close();
    }, 90_000);
  }

  it('the curve page states the odds for its label on an optic', async () => {
    const [lab] = await query<{ id: number }>(
      `SELECT min(id) AS id FROM curves WHERE status = 'verified' AND aoi_deg = 0 AND 'Ha' = ANY(lines) GROUP BY label HAVING count(*) >= 3 ORDER BY count(*) DESC LIMIT 1`,
    );
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 }, colorScheme: 'dark' });
    const page = await context.newPage();
    await page.goto(`${BASE}/curves/${lab.id}`);
    const odds = page.getByTestId('unit-odds');
    await expect.poll(() => odds.getByTestId('odds-sentence').count(), { timeout: 30_000 }).toBe(1);
    await expect(odds.getByTestId('odds-sentence').textContent()).resolves.toMatch(/^\d+ of \d+ measured units; (about \d+ %|nearly all|almost none) of units, from \d+ measurements\.$/);
    await screenshot(page, 'curve-odds-night');
    await context.close();
  }, 60_000);

  it('the catalogue sorts by contrast under a chosen sky and shows the odds column for the optic', async () => {
    const context = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    await page.goto(`${BASE}/curves?line=Ha&fNumber=2.5&obstruction=0.36&sort=contrast&sky=dark`);
    await expect.poll(() => page.getByTestId('contrast-note').count(), { timeout: 30_000 }).toBe(1);
    await expect(page.getByTestId('contrast-note').textContent()).resolves.toMatch(/computed exactly/);
    const gains = await page.getByTestId('sky-gain').evaluateAll((els) => els.map((e) => Number(e.getAttribute('data-raw'))));
    expect(gains.length).toBeGreaterThan(1);
    expect([...gains].sort((a, b) => b - a)).toEqual(gains);
    await expect.poll(() => page.locator('[data-testid="odds-cell"]').count(), { timeout: 30_000 }).toBeGreaterThan(0);
    await expect
      .poll(async () => (await page.locator('[data-testid="odds-cell"]').allTextContents()).some((t) => /^\d+\/\d+/.test(t)), { timeout: 30_000 })
      .toBe(true);
    await screenshot(page, 'catalogue-contrast');
    await context.close();
  }, 60_000);
});
