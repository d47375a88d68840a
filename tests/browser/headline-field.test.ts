import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { browserForFile, screenshot } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';

const browser = browserForFile();

type Cone = { lines: { id: string; throughput: number }[] };

async function cone(body: Record<string, unknown>): Promise<Cone> {
  const res = await fetch(`${BASE}/api/model/cone`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  expect(res.status).toBe(200);
  return (await res.json()) as Cone;
}

// Percent to one decimal, as docs/design.md §Type asks for transmission.
const pct = (f: number) => `${(Math.round(f * 1000) / 10).toFixed(1)} %`;

async function noOverflow(page: Page, width: number) {
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width);
}

describe('one field point for every headline throughput', () => {
  it('the curve page, the study and the compare board give the same on-axis headline for one optic, say so, and keep the overlay ticked', async () => {
    const [curve] = await query<{ id: number }>(
      `SELECT id FROM curves WHERE status = 'verified' AND lines = ARRAY['Ha'] AND set_key IS NULL AND aoi_deg = 0 AND n_eff IS NULL AND fwhm_nm < 6 ORDER BY fwhm_nm LIMIT 1`,
    );
    const optics = await query<{ id: number; name: string; f_number: number; obstruction: number; field_angle_deg: number }>(
      `SELECT id, name, f_number, obstruction, field_angle_deg FROM optics WHERE is_example AND field_angle_deg >= 6 ORDER BY f_number LIMIT 2`,
    );
    expect(optics).toHaveLength(2);
    const [fast, other] = optics;
    const model = (o: (typeof optics)[number], fieldAngleDeg: number) =>
      cone({ curveId: curve.id, optic: { fNumber: o.f_number, obstruction: o.obstruction, fieldAngleDeg }, nEff: 2, lines: ['Ha'] }).then((r) => r.lines[0].throughput);
    const fastAxis = await model(fast, 0);
    const fastEdge = await model(fast, fast.field_angle_deg);
    // the case that matters: the edge is a different number from the centre
    expect(Math.abs(fastAxis - fastEdge)).toBeGreaterThan(0.001);

    const context = await browser().newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    await page.goto(`${BASE}/curves/${curve.id}`);
    const overlay = page.getByTestId('cone-overlay');
    await overlay.locator('select').selectOption(String(fast.id));
    await page.getByTestId('overlay-toggle').check();
    await expect.poll(() => page.getByTestId('headline-throughput').first().getAttribute('data-raw'), { timeout: 30_000 }).toBe(String(fastAxis));
    await expect(page.getByTestId('headline-field').textContent()).resolves.toBe('on axis');
    // the field edge is the second number, named as such
    await expect(page.getByTestId('edge-result').textContent()).resolves.toContain(`field edge: Hα keeps ${pct(fastEdge)}`);

    // another optic: the overlay stays ticked and follows it
    const otherAxis = await model(other, 0);
    await overlay.locator('select').selectOption(String(other.id));
    await expect.poll(() => page.getByTestId('headline-throughput').first().getAttribute('data-raw'), { timeout: 30_000 }).toBe(String(otherAxis));
    expect(await page.getByTestId('overlay-toggle').isChecked()).toBe(true);
    await overlay.locator('select').selectOption(String(fast.id));
    await expect.poll(() => page.getByTestId('headline-throughput').first().getAttribute('data-raw'), { timeout: 30_000 }).toBe(String(fastAxis));
    await screenshot(page, 'headline-curve-1440');

    // the study's headline for the same curve and optic is the same number, also said to be on axis
    await page.goto(`${BASE}/study?curve=${curve.id}&optic=${fast.id}`);
    await expect.poll(() => page.getByTestId('verdict-throughput').first().getAttribute('data-raw'), { timeout: 30_000 }).not.toBe(null);
    await expect.poll(async () => Number(await page.getByTestId('verdict-throughput').first().getAttribute('data-raw')), { timeout: 30_000 }).toBeCloseTo(fastAxis, 12);
    await expect(page.getByTestId('verdict').first().textContent()).resolves.toMatch(/reaches the sensor on axis/);

    // and the compare board's, for a saved optic with a chief-ray angle
    await page.goto(`${BASE}/compare?curves=${curve.id}`);
    await page.getByTestId('compare-optic').selectOption(String(fast.id));
    await expect.poll(() => page.getByTestId(`compare-throughput-${curve.id}`).textContent(), { timeout: 30_000 }).toContain(pct(fastAxis));
    await expect(page.getByTestId('headline-field').textContent()).resolves.toBe('on axis');
    await context.close();

    // on a phone: the same words, nothing wider than the screen
    const phone = await browser().newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 2 });
    const small = await phone.newPage();
    await small.goto(`${BASE}/curves/${curve.id}`);
    await small.getByTestId('cone-overlay').locator('select').selectOption(String(fast.id));
    await small.getByTestId('overlay-toggle').check();
    await expect.poll(() => small.getByTestId('headline-throughput').first().getAttribute('data-raw'), { timeout: 30_000 }).toBe(String(fastAxis));
    await noOverflow(small, 390);
    await screenshot(small, 'headline-curve-390');
    await phone.close();
  });
});
