import { describe, expect, it } from 'vitest';
import { deflateRawSync } from 'node:zlib';
import { curvesFromFragment, pastedFragment } from '@/lib/study/pasted-link';
import { computeMetrics } from '@/lib/engine/metrics';
import type { StudyCurve } from '@/lib/study/types';

function pasted(label: string, n: number): StudyCurve {
  // a flat-topped passband with awkward decimals, so an inexact round trip would show
  const wavelengthNm = Array.from({ length: n }, (_, k) => 640 + k * 0.0371 + 1e-9 * k);
  const transmission = wavelengthNm.map((w) => (Math.abs(w - 656.3) < 1.5 ? 0.9123456789 : 0.0012345));
  const points = { wavelengthNm, transmission };
  const m = computeMetrics(points);
  return { key: 'p1', id: null, label, source: 'pasted', status: null, lines: [], aoiDeg: 3.5, nEff: null, tempC: null, cwlNm: m.cwlNm, fwhmNm: m.fwhmNm, peakT: m.peakT, points, set: null };
}

describe('pasted curves in a study link', () => {
  it('come back exactly, with their label, angle and derived numbers', async () => {
    const curves = [pasted('Bench unit 7', 900), pasted('Spare', 40)];
    const catalogue: StudyCurve = { ...pasted('stored', 10), source: 'catalogue', id: 12, key: 'c12' };
    const fragment = await pastedFragment([catalogue, ...curves]);
    expect(fragment).toMatch(/^#pasted=[A-Za-z0-9_-]+$/);
    // deflated: far shorter than the numbers as text
    expect(fragment.length).toBeLessThan(JSON.stringify(curves.map((c) => c.points)).length / 2);
    const back = await curvesFromFragment(fragment);
    expect(back).toHaveLength(2);
    back.forEach((b, k) => {
      expect(b.points).toEqual(curves[k].points);
      expect([b.label, b.aoiDeg, b.source, b.id]).toEqual([curves[k].label, 3.5, 'pasted', null]);
      expect([b.cwlNm, b.fwhmNm, b.peakT]).toEqual([curves[k].cwlNm, curves[k].fwhmNm, curves[k].peakT]);
    });
  });

  it('no pasted curve, no fragment; no fragment, no curve', async () => {
    expect(await pastedFragment([])).toBe('');
    expect(await curvesFromFragment('')).toEqual([]);
    expect(await curvesFromFragment('#other=1')).toEqual([]);
  });

  it('a cut or altered link is refused with a sentence, never half-read', async () => {
    const fragment = await pastedFragment([pasted('Bench unit 7', 300)]);
    await expect(curvesFromFragment(fragment.slice(0, fragment.length / 2))).rejects.toThrow(/could not be read/);
    // well-formed but wrong: deflated by an independent implementation (Node's zlib), then base64url
    const forged = (value: unknown) => `#pasted=${deflateRawSync(Buffer.from(JSON.stringify(value))).toString('base64url')}`;
    await expect(curvesFromFragment(forged([{ label: 'x', aoiDeg: 0, w: [1, 2, 3, 4, 5, 6], t: [0, 0, 0, 0, 0] }]))).rejects.toThrow(/differ in length/);
    await expect(curvesFromFragment(forged([{ label: 'x', aoiDeg: 95, w: [1, 2, 3, 4, 5], t: [0, 0, 0, 0, 0] }]))).rejects.toThrow(/not usable/);
    await expect(curvesFromFragment(forged({ not: 'a list' }))).rejects.toThrow(/not usable/);
    // and what Node's zlib deflates, we read: the format is plain raw deflate
    const ok = await curvesFromFragment(forged([{ label: 'From zlib', aoiDeg: 0, w: [650, 655, 656, 657, 662], t: [0, 0.5, 0.9, 0.5, 0] }]));
    expect(ok[0].label).toBe('From zlib');
  });
});
