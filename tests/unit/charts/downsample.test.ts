import { describe, expect, it } from 'vitest';
import { downsampleLttb, finitePairs } from '@/components/charts/downsample';
import { ascending, passbandStats, passbandWindow, valueAt } from '@/components/charts/passband';

const butterworth = (nm: number, cwl = 656.3, half = 2.5, peak = 0.9) => peak / (1 + ((nm - cwl) / half) ** 6);
const grid = (from: number, to: number, step: number) =>
  Array.from({ length: Math.round((to - from) / step) + 1 }, (_, i) => from + i * step);

describe('downsampleLttb', () => {
  it('keeps the ends and the requested count', () => {
    const x = grid(400, 800, 0.1);
    const y = x.map((v) => butterworth(v));
    const out = downsampleLttb(x, y, 60);
    expect(out.x).toHaveLength(60);
    expect(out.x[0]).toBe(400);
    expect(out.x[59]).toBeCloseTo(800, 6);
  });

  it('keeps a narrow peak that striding would miss', () => {
    const x = grid(400, 800, 0.1);
    const y = x.map((v) => butterworth(v, 656.3, 0.8));
    const out = downsampleLttb(x, y, 60);
    expect(Math.max(...out.y)).toBeGreaterThan(0.8);
  });

  it('returns short series unchanged', () => {
    expect(downsampleLttb([1, 2, 3], [4, 5, 6], 60)).toEqual({ x: [1, 2, 3], y: [4, 5, 6] });
  });

  it('drops non-finite pairs', () => {
    expect(finitePairs([1, NaN, 3, 4], [1, 2, Infinity, 4])).toEqual({ x: [1, 4], y: [1, 4] });
  });
});

describe('passband reading', () => {
  const x = grid(640, 672, 0.05);
  const y = x.map((v) => butterworth(v));

  it('finds peak, centre and half-maximum width', () => {
    const s = passbandStats(x, y)!;
    expect(s.peak).toBeCloseTo(0.9, 3);
    expect(s.centre!).toBeCloseTo(656.3, 2);
    // Half maximum of 1/(1+u^6) falls at u = 1, so FWHM = 2 × 2.5 nm.
    expect(s.width!).toBeCloseTo(5, 2);
  });

  it('interpolates between samples and refuses to extrapolate', () => {
    expect(valueAt([1, 2], [10, 20], 1.25)).toBeCloseTo(12.5);
    expect(valueAt([1, 2], [10, 20], 3)).toBeNull();
  });

  it('sorts scans taken from red to blue', () => {
    expect(ascending([3, 2, 1], [30, 20, 10])).toEqual({ x: [1, 2, 3], y: [10, 20, 30] });
  });

  it('zooms to the passband only when it is small in the scan', () => {
    const wide = grid(400, 800, 0.5);
    const win = passbandWindow([{ x: wide, y: wide.map((v) => butterworth(v)) }], [400, 800])!;
    expect(win[0]).toBeLessThan(653);
    expect(win[1]).toBeGreaterThan(659);
    expect(win[1] - win[0]).toBeLessThan(60);
    expect(passbandWindow([{ x, y }], [640, 672])).toBeNull();
  });
});
