import { describe, expect, it } from 'vitest';
import { xMedian, xMaxValue, xyIntegration, xyMaxYPoint } from 'ml-spectra-processing';
import { BLOCKING_OD_CAP, computeMetrics } from '@/lib/engine/metrics';
import { flatTop, gaussian, multiCavity } from './fixtures';

describe('half-maximum numbers (docs/model.md §Derived numbers)', () => {
  it('a Gaussian passband has FWHM = 2·sqrt(2 ln 2)·σ and CWL at its centre (any statistics handbook)', () => {
    const sigma = 1.7;
    const m = computeMetrics(gaussian(656.3, sigma, 0.88, 0.01));
    expect(m.fwhmNm!).toBeCloseTo(2 * Math.sqrt(2 * Math.LN2) * sigma, 3);
    expect(m.cwlNm!).toBeCloseTo(656.3, 6);
    expect(m.peakT).toBeCloseTo(0.88, 12);
    // its area is σ·sqrt(2π)·peak, so the effective bandwidth is σ·sqrt(2π)
    expect(m.effectiveBandwidthNm!).toBeCloseTo(sigma * Math.sqrt(2 * Math.PI), 4);
  });

  it('places the edges by linear interpolation between the samples either side of half maximum', () => {
    const m = computeMetrics({ wavelengthNm: [650, 651, 652, 653, 654, 655], transmission: [0, 0.2, 0.8, 1, 0.6, 0] });
    // left: 0.5 between 0.2@651 and 0.8@652 → 651.5; right: 0.5 between 0.6@654 and 0@655 → 654 + 1/6
    expect(m.leftNm).toBeCloseTo(651.5, 12);
    expect(m.rightNm).toBeCloseTo(654 + 1 / 6, 12);
    expect(m.fwhmNm).toBeCloseTo(654 + 1 / 6 - 651.5, 12);
    expect(m.cwlNm).toBeCloseTo((651.5 + 654 + 1 / 6) / 2, 12);
  });

  it('walks out from the global maximum, so a side lobe above half maximum does not stop it early', () => {
    const m = computeMetrics({
      wavelengthNm: [640, 645, 650, 652, 654, 656, 658, 660, 665],
      transmission: [0, 0.6, 0.1, 0.2, 0.9, 1, 0.9, 0.1, 0],
    });
    expect(m.leftNm!).toBeGreaterThan(652);
    expect(m.leftNm!).toBeLessThan(654);
  });

  it('reports undefined edges as null and says why', () => {
    const m = computeMetrics({ wavelengthNm: [650, 651, 652, 653, 654], transmission: [0.1, 0.3, 0.6, 0.8, 0.9] });
    expect(m.leftNm).not.toBeNull();
    expect(m.rightNm).toBeNull();
    expect(m.fwhmNm).toBeNull();
    expect(m.cwlNm).toBeNull();
    expect(m.meanInBandT).toBeNull();
    expect(m.blockingOd).toBeNull();
    expect(m.warnings.join(' ')).toMatch(/red side/);
  });

  it('handles an all-zero curve without dividing by zero', () => {
    const m = computeMetrics({ wavelengthNm: [1, 2, 3, 4, 5], transmission: [0, 0, 0, 0, 0] });
    expect(m.peakT).toBe(0);
    expect(m.effectiveBandwidthNm).toBeNull();
    expect(m.warnings.length).toBeGreaterThan(0);
  });
});

describe('cross-checked against ml-spectra-processing on the same arrays', () => {
  const pts = multiCavity(500.7, 3, 3, { ripple: 0.02, noise: 0.01, seed: 11 });
  const data = { x: pts.wavelengthNm, y: pts.transmission };
  const m = computeMetrics(pts);

  it('peak transmission and its wavelength (xyMaxYPoint, xMaxValue)', () => {
    const p = xyMaxYPoint(data);
    expect(m.peakT).toBe(p.y);
    expect(m.peakT).toBe(xMaxValue(pts.transmission));
    expect(m.peakNm).toBe(p.x);
  });

  it('effective bandwidth = trapezoid integral / peak (xyIntegration)', () => {
    expect(m.effectiveBandwidthNm!).toBeCloseTo(xyIntegration(data) / xMaxValue(pts.transmission), 10);
  });

  it('median sample step (xMedian of the spacings)', () => {
    const steps = pts.wavelengthNm.slice(1).map((x, i) => x - pts.wavelengthNm[i]);
    expect(m.medianStepNm).toBeCloseTo(xMedian(steps), 12);
  });

  it('mean in-band T when the half-maximum points fall on samples (xyIntegration over the band)', () => {
    const x = [640, 645, 650, 651, 652, 653, 654, 655, 656, 660, 665, 670];
    const y = [0, 0.01, 0.45, 0.7, 0.9, 0.86, 0.88, 0.9, 0.45, 0.01, 0, 0];
    const mm = computeMetrics({ wavelengthNm: x, transmission: y });
    expect(mm.leftNm).toBe(650);
    expect(mm.rightNm).toBe(656);
    expect(mm.meanInBandT!).toBeCloseTo(xyIntegration({ x, y }, { from: 650, to: 656 }) / 6, 12);
  });
});

describe('blocking', () => {
  it('is −log10 of the highest transmission outside CWL ± 2·FWHM', () => {
    const pts = flatTop(656, 3, 0.2, 0.9, 0.05, 20);
    const i = pts.wavelengthNm.findIndex((x) => x > 670);
    pts.transmission[i] = 1e-3;
    pts.transmission[i + 5] = 2e-4;
    const m = computeMetrics(pts);
    expect(m.blockingOd).toBeCloseTo(3, 12);
  });

  it('is capped (and says so) when nothing is measurable outside the band', () => {
    const m = computeMetrics(flatTop(656, 3, 0.2, 0.9, 0.05, 20));
    expect(m.blockingOd).toBe(BLOCKING_OD_CAP);
    expect(m.warnings.join(' ')).toMatch(/reporting limit/);
  });

  it('is null (with a warning) when no sample lies outside CWL ± 2·FWHM', () => {
    const m = computeMetrics(flatTop(656, 3, 0.2, 0.9, 0.05, 3));
    expect(m.blockingOd).toBeNull();
    expect(m.warnings.join(' ')).toMatch(/No samples lie outside/);
  });
});

describe('line transmissions', () => {
  it('reads T at each catalogued line and marks lines outside the range', () => {
    const m = computeMetrics(multiCavity(656.28, 6, 3, { half: 10 }));
    const ha = m.lines.find((l) => l.id === 'Ha')!;
    expect(ha.covered).toBe(true);
    expect(ha.transmission).toBeCloseTo(0.92, 2);
    const oiii = m.lines.find((l) => l.id === 'OIII')!;
    expect(oiii.covered).toBe(false);
    expect(oiii.transmission).toBe(0);
    expect(m.lines).toHaveLength(13);
  });
});
