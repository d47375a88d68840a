import { describe, expect, it } from 'vitest';
import { browserForFile, screenshot } from '../support/browser';
import { BASE } from '../support/http';
import { query } from '../support/db';
import { normalCwlNm } from '@/lib/catalogue/units';

const browser = browserForFile();

describe('the catalogue lists units, not their angles', () => {
  it('shows a multi-angle set as one row with its angles, opening to each curve; the CWL column at normal incidence; the curve page as measured', async () => {
    const [set] = await query<{ label: string; ids: number[]; aois: number[] }>(
      `SELECT min(label) AS label, array_agg(id ORDER BY aoi_deg, id) AS ids, array_agg(aoi_deg ORDER BY aoi_deg, id) AS aois
       FROM curves WHERE status = 'verified' AND set_key IS NOT NULL GROUP BY set_key, revision HAVING count(*) >= 3 ORDER BY 1 LIMIT 1`,
    );
    expect(set).toBeDefined();
    const [alone] = await query<{ id: number; cwl_nm: number; aoi_deg: number; n_eff: number | null; label: string }>(
      `SELECT id, cwl_nm, aoi_deg, n_eff, label FROM curves WHERE status = 'verified' AND set_key IS NULL AND aoi_deg >= 5 AND cwl_nm IS NOT NULL ORDER BY aoi_deg DESC, id LIMIT 1`,
    );
    expect(alone).toBeDefined();

    for (const width of [1440, 390]) {
      const context = await browser().newContext({ viewport: { width, height: 1000 } });
      const page = await context.newPage();
      await page.goto(`${BASE}/curves?q=${encodeURIComponent(`"${set.label}"`)}&pageSize=100`);
      await page.waitForSelector('[data-testid="results"] tbody tr');
      const shown = await page.locator('[data-testid="results"] tbody tr').evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-curve-id'))));
      // the set's lead only
      expect(shown.filter((id) => set.ids.includes(id))).toEqual([set.ids[0]]);
      const row = page.locator(`[data-testid="results"] tbody tr[data-curve-id="${set.ids[0]}"]`);
      const angles = row.getByTestId('unit-set');
      await expect(angles.locator('summary').textContent()).resolves.toContain(`Measured at ${set.ids.length} angles`);
      await angles.locator('summary').click();
      const links = await angles.getByTestId('unit-set-curve').evaluateAll((as) => as.map((a) => a.getAttribute('href')));
      expect(links).toEqual(set.ids.map((id) => `/curves/${id}`));
      // opening the list did not open the row's curve
      expect(new URL(page.url()).pathname).toBe('/curves');
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width);
      await screenshot(page, `catalogue-units-${width}`);
      await context.close();
    }

    // an off-normal curve: its CWL column is at normal incidence (the engine's rule), its page as measured
    const context = await browser().newContext({ viewport: { width: 1440, height: 1000 } });
    const page = await context.newPage();
    const normal = normalCwlNm(alone.cwl_nm, alone.aoi_deg, alone.n_eff)!;
    await page.goto(`${BASE}/curves?cwlMin=${(normal - 0.01).toFixed(3)}&cwlMax=${(normal + 0.01).toFixed(3)}&pageSize=100`);
    await page.waitForSelector(`[data-testid="results"] tbody tr[data-curve-id="${alone.id}"]`);
    const cell = page.locator(`[data-testid="results"] tbody tr[data-curve-id="${alone.id}"] [data-testid="cwl"]`);
    expect(Number(await cell.getAttribute('data-raw'))).toBeCloseTo(normal, 9);
    await expect(cell.textContent()).resolves.toBe(`${normal.toFixed(2)} nm`);
    await page.goto(`${BASE}/curves/${alone.id}`);
    const measured = (await page.getByTestId('derived-cwl').textContent())!;
    expect(measured).toContain(`as measured at ${alone.aoi_deg.toFixed(1)}°`);
    expect(measured).toContain(`${alone.cwl_nm.toFixed(2)} nm`);
    await context.close();
  });
});
