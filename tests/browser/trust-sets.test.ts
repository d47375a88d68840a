// Issue 16 in the interface, at a phone's width (390 px) and in the night view: a set's files take
// their own temperature and polarisation on upload; a polarised set shows its s and p indices on the
// curve page and in the study; the verdict card weighs the error bar against the throughput the
// user needs; a converging-beam curve offers its beam correction.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launch, screenshot, signInAs } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { curveCsv, HA_NM } from '../integration/submissions-fixtures';
import { closeSequelize } from '@/db/connection';

let browser: Browser;
let dir: string;
beforeAll(async () => {
  browser = await launch();
  dir = mkdtempSync(path.join(tmpdir(), 'bandcone-trust-'));
});
afterAll(async () => {
  await browser?.close();
  await closeSequelize();
});

async function phone(): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  return context.newPage();
}

const fits = async (page: Page) => expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

async function night(page: Page) {
  await page.locator('button[data-ready]', { hasText: 'Night view' }).click();
  await page.waitForFunction(() => document.documentElement.dataset.view === 'night');
  await fits(page);
}

describe('trusting a measurement, at 390 px', () => {
  it('a set takes each file’s temperature and polarisation on upload; s and p indices are fitted from them', async () => {
    const user = await makeUser('contributor');
    const page = await phone();
    await signInAs(page, user.email, user.password);
    await page.goto(`${BASE}/submit`);
    // n_s = 1.95, n_p = 1.85 (closed form, docs/model.md §Angle shift); 0° counts for both
    const takes = [
      { aoi: 0, n: 1.9, pol: 'unpolarized', t: '20' },
      { aoi: 15, n: 1.95, pol: 's', t: '21' },
      { aoi: 15, n: 1.85, pol: 'p', t: '22' },
    ];
    const files = takes.map((k, i) => {
      const file = path.join(dir, `sp-${i}-aoi${k.aoi}.csv`);
      writeFileSync(file, curveCsv({ cwlNm: HA_NM, fwhmNm: 3, aoiDeg: k.aoi, nEff: k.n, noiseSeed: (Date.now() % 1_000_000) + i }));
      return file;
    });
    await page.waitForSelector('.uppy-Dashboard-input', { state: 'attached' });
    await page.locator('.uppy-Dashboard-input').first().setInputFiles(files);
    await page.waitForFunction(() => document.querySelectorAll('[data-testid=derived-numbers]').length >= 3, undefined, { timeout: 30_000 });
    await expect(page.getByTestId('file-conditions').count()).resolves.toBe(3);
    for (const [i, k] of takes.entries()) {
      await page.getByTestId('aoi-input').nth(i).fill(String(k.aoi));
      await page.getByTestId('file-temp-input').nth(i).fill(k.t);
      await page.getByTestId('file-pol-input').nth(i).selectOption(k.pol);
    }
    // a temperature outside the model's range is named beside its file
    await page.getByTestId('file-temp-input').nth(2).fill('95');
    const label = `Polarised walkthrough Hα ${Date.now()}`;
    await page.locator('#m-label').fill(label);
    await page.getByLabel('Hα').check();
    await page.locator('#m-nominalCwlNm').fill(String(HA_NM));
    await page.locator('#m-nominalFwhmNm').fill('3');
    await page.locator('#m-method\\.instrument').selectOption('spectrophotometer');
    await page.locator('#m-method\\.resolutionNm').fill('0.05');
    await page.locator('#m-method\\.beam').selectOption('collimated');
    await page.locator('#m-method\\.coating').selectOption('hard');
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await expect(page.locator('#file-2-temperatureC-error').textContent()).resolves.toContain('above 80 °C');
    await fits(page);
    await screenshot(page, 'trust-upload-conditions-390');
    await page.getByTestId('file-temp-input').nth(2).fill(takes[2].t);
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await page.waitForURL(/\/account\/submissions\/\d+/, { timeout: 30_000 });
    const id = Number(new URL(page.url()).pathname.split('/').pop());
    const rows = await query<{ pol: string; t: string; s: number; p: number }>(
      `SELECT method->>'polarization' AS pol, method->>'temperatureC' AS t, n_eff_s AS s, n_eff_p AS p FROM curves WHERE submission_id = :id ORDER BY id`,
      { id },
    );
    expect(rows.map((r) => r.pol)).toEqual(takes.map((k) => k.pol));
    expect(rows.map((r) => r.t)).toEqual(takes.map((k) => k.t));
    expect(rows[0].s).toBeCloseTo(1.95, 1);
    expect(rows[0].p).toBeCloseTo(1.85, 1);
    await page.context().close();
  });

  it('the demo world’s polarised set shows s and p indices on its curve page and in the study, by night too', async () => {
    const [c] = await query<{ id: number; s: number; p: number }>(
      `SELECT id, n_eff_s AS s, n_eff_p AS p FROM curves WHERE status = 'verified' AND n_eff_s IS NOT NULL AND label LIKE 'Tessaly & Hume%' ORDER BY aoi_deg, id LIMIT 1`,
    );
    expect(c).toBeDefined();
    const page = await phone();
    await page.goto(`${BASE}/curves/${c.id}`);
    await expect(page.getByTestId('derived-neff-sp').textContent()).resolves.toContain(`s ${c.s.toFixed(2)} · p ${c.p.toFixed(2)}`);
    await expect(page.getByText('hard (sputtered, ion-assisted)').count()).resolves.toBeGreaterThan(0);
    await fits(page);
    await page.goto(`${BASE}/study?curve=${c.id}`);
    await page.waitForSelector('[data-testid=verdict-neff]');
    await expect(page.getByTestId('verdict-neff').textContent()).resolves.toBe(`s ${c.s.toFixed(2)} · p ${c.p.toFixed(2)}`);
    await fits(page);
    await night(page);
    await screenshot(page, 'trust-study-polarised-390-night');
    await page.context().close();
  });

  it('the verdict card says when the error bar straddles the throughput the user needs', async () => {
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND 'Ha' = ANY(lines) AND aoi_deg = 0 ORDER BY id LIMIT 1`);
    const page = await phone();
    // far from the line's centre the error bar is wide: put the line on an edge with a pre-shift
    await page.goto(`${BASE}/study?curve=${c.id}&f=2&shift=-1.5`);
    await page.waitForSelector('[data-testid=verdict-range]');
    const range = page.getByTestId('verdict-range');
    const lo = Number(await range.getAttribute('data-low'));
    const hi = Number(await range.getAttribute('data-high'));
    expect(hi).toBeGreaterThan(lo);
    const mid = Math.round(((lo + hi) / 2) * 1000) / 10;
    await page.goto(`${BASE}/study?curve=${c.id}&f=2&shift=-1.5&need=${mid}`);
    await page.waitForSelector('[data-testid=verdict-need]');
    await expect(page.getByTestId('verdict-need').getAttribute('data-kind')).resolves.toBe('straddles');
    await expect(page.locator('#study-need').inputValue()).resolves.toBe(String(mid));
    await fits(page);
    await screenshot(page, 'trust-study-need-390');
    await page.goto(`${BASE}/study?curve=${c.id}&f=2&shift=-1.5&need=1`);
    await page.waitForSelector('[data-testid=verdict-need]');
    await expect(page.getByTestId('verdict-need').getAttribute('data-kind')).resolves.toBe('clears');
    await page.context().close();
  });

  it('a curve measured in a converging beam offers its correction, which opens the study with it as a pre-shift', async () => {
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND method->>'beam' = 'converging' ORDER BY id LIMIT 1`);
    expect(c).toBeDefined();
    const page = await phone();
    await page.goto(`${BASE}/curves/${c.id}`);
    const link = page.getByTestId('beam-correction').getByRole('link');
    const text = (await link.textContent())!;
    const nm = Number(text.match(/\(([+-][\d.]+) nm\)/)![1]);
    expect(nm).toBeGreaterThan(0);
    await fits(page);
    await night(page);
    await screenshot(page, 'trust-beam-correction-390-night');
    await link.click();
    await page.waitForURL(/\/study\?/);
    expect(new URL(page.url()).searchParams.get('shift')).toBe(String(nm));
    await expect(page.locator('#study-shift').inputValue()).resolves.toBe(String(nm));
    await page.context().close();
  });
});
