import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { xyIntegration } from 'ml-spectra-processing';
import { cleanPoints, cumulativeAt, interpolate, isCovered, meanOver, prepareCurve, sampleAt, sampleSorted } from '@/lib/engine/curve';
import { EngineInputError } from '@/lib/engine/errors';

const pts = { wavelengthNm: [650, 651, 653, 654, 656], transmission: [0, 0.4, 0.8, 0.6, 0] };

describe('linear interpolation, zero outside the range (docs/model.md §Curve)', () => {
  const c = prepareCurve(pts);
  it('interpolates between samples and returns samples exactly', () => {
    expect(interpolate(c, 652)).toBeCloseTo(0.6, 14);
    expect(interpolate(c, 653)).toBe(0.8);
    expect(interpolate(c, 655)).toBeCloseTo(0.3, 14);
  });
  it('is zero outside and flags coverage', () => {
    expect(interpolate(c, 649.99)).toBe(0);
    expect(interpolate(c, 656.01)).toBe(0);
    expect(isCovered(c, 649.99)).toBe(false);
    expect(isCovered(c, 650)).toBe(true);
  });
  it('the sorted sweep gives the same values as binary search (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 640, max: 660, noNaN: true }), { maxLength: 100 }), (xs) => {
        const sorted = [...xs].sort((a, b) => a - b);
        expect(Array.from(sampleSorted(c, sorted))).toEqual(Array.from(sampleAt(c, sorted)));
      }),
    );
  });
  it('the running integral matches the trapezoid rule (ml-spectra-processing xyIntegration)', () => {
    expect(cumulativeAt(c, 656)).toBeCloseTo(xyIntegration({ x: pts.wavelengthNm, y: pts.transmission }), 14);
    expect(cumulativeAt(c, 653)).toBeCloseTo(xyIntegration({ x: pts.wavelengthNm, y: pts.transmission }, { from: 650, to: 653 }), 14);
    expect(cumulativeAt(c, 700)).toBe(c.total);
    expect(cumulativeAt(c, 600)).toBe(0);
  });
  it('the mean over an interval is exact for the piecewise-linear curve', () => {
    // over [651, 653] T rises linearly 0.4 → 0.8, mean 0.6; over [655, 660] half the span is outside (zero)
    expect(meanOver(c, 651, 653)).toBeCloseTo(0.6, 14);
    expect(meanOver(c, 655, 657)).toBeCloseTo((0.5 * 0.3) / 2, 14);
    expect(meanOver(c, 652, 652)).toBeCloseTo(0.6, 14);
  });
});

describe('clean-up of points sent as JSON', () => {
  it('sorts, merges identical repeats and clamps noise below zero', () => {
    const r = cleanPoints({ wavelengthNm: [654, 650, 651, 651, 653, 656], transmission: [0.6, -0.002, 0.4, 0.4, 0.8, 0] });
    expect(r.points).toEqual({ wavelengthNm: [650, 651, 653, 654, 656], transmission: [0, 0.4, 0.8, 0.6, 0] });
    expect(r.warnings.length).toBe(2);
  });
  it('refuses repeats with different values, naming both points', () => {
    try {
      cleanPoints({ wavelengthNm: [650, 651, 652, 651, 654], transmission: [0, 0.4, 0.8, 0.5, 0] });
      throw new Error('not refused');
    } catch (e) {
      expect(e).toBeInstanceOf(EngineInputError);
      expect((e as Error).message).toMatch(/Points 1 and 3/);
    }
  });
  it('refuses non-finite, negative, absurd or too few values', () => {
    const bad = [
      { wavelengthNm: [650, 651, 652, 653, NaN], transmission: [0, 0, 0, 0, 0] },
      { wavelengthNm: [650, 651, 652, 653, 654], transmission: [0, 0, -0.1, 0, 0] },
      { wavelengthNm: [650, 651, 652, 653, 654], transmission: [0, 0, 1.6, 0, 0] },
      { wavelengthNm: [650, 651, 652, 653], transmission: [0, 0, 1, 0] },
      { wavelengthNm: [650, 651, 652, 653, 654], transmission: [0, 0, 1, 0] },
      { wavelengthNm: [-650, 651, 652, 653, 654], transmission: [0, 0, 1, 0, 0] },
    ];
    for (const p of bad) expect(() => cleanPoints(p)).toThrow(EngineInputError);
  });
});
