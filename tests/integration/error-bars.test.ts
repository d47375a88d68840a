import { afterAll, describe, expect, it } from 'vitest';
import { anonymous, json } from '../support/http';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';
import { DEFAULT_WAVELENGTH_UNCERTAINTY_NM } from '@/lib/engine/quality';

afterAll(() => closeSequelize());

type Item = { id: number; instrument: string; throughput: number; throughputRange?: [number, number] };

describe('error bars in the catalogue and the cone response', () => {
  const visitor = anonymous();

  it('every fitness row carries a throughputRange around its throughput', async () => {
    const res = await visitor.fetch('/api/curves?line=Ha&fNumber=2.5&obstruction=0.36&sort=throughput&pageSize=20');
    expect(res.status).toBe(200);
    const { items } = await json<{ items: Item[] }>(res);
    expect(items.length).toBeGreaterThan(3);
    for (const i of items) {
      const [lo, hi] = i.throughputRange!;
      expect(lo).toBeLessThanOrEqual(i.throughput + 1e-12);
      expect(hi).toBeGreaterThanOrEqual(i.throughput - 1e-12);
    }
    // an uncertainty of a few tenths of a nm moves some line throughput on a narrowband filter
    expect(items.some((i) => i.throughputRange![1] - i.throughputRange![0] > 1e-3)).toBe(true);
  });

  it("a stored curve's cone response uses its instrument's default uncertainty unless one is sent", async () => {
    const [c] = await query<{ id: number; instrument: string }>(`SELECT id, instrument FROM curves WHERE status = 'verified' AND 'Ha' = ANY(lines) AND (method->>'wavelengthUncertaintyNm') IS NULL ORDER BY id LIMIT 1`);
    const ask = async (extra: Record<string, unknown>) => {
      const r = await visitor.fetch('/api/model/cone', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ curveId: c.id, optic: { fNumber: 2.5, obstruction: 0.36 }, nEff: 2, lines: ['Ha'], ...extra }),
      });
      expect(r.status, await r.clone().text()).toBe(200);
      return (await r.json()) as { lines: { throughputRange: [number, number] }[]; bestPreShift: { nmRange: [number, number] } };
    };
    const byDefault = await ask({});
    const explicit = await ask({ wavelengthUncertaintyNm: DEFAULT_WAVELENGTH_UNCERTAINTY_NM[c.instrument] });
    expect(byDefault.lines[0].throughputRange).toEqual(explicit.lines[0].throughputRange);
    const wider = await ask({ wavelengthUncertaintyNm: 1 });
    expect(wider.lines[0].throughputRange[0]).toBeLessThanOrEqual(byDefault.lines[0].throughputRange[0]);
    expect(wider.bestPreShift.nmRange[1] - wider.bestPreShift.nmRange[0]).toBeGreaterThanOrEqual(2 - 1e-9);
  });

  it('an uncertainty out of range is a 422 with a sentence', async () => {
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 1`);
    const r = await visitor.fetch('/api/model/cone', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ curveId: c.id, optic: { fNumber: 2.5, obstruction: 0.36 }, nEff: 2, wavelengthUncertaintyNm: 50 }),
    });
    expect(r.status).toBe(422);
    expect(((await r.json()) as { error: string }).error).toContain('at most 10 nm');
  });
});
