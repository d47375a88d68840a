import { describe, expect, it } from 'vitest';
import { assessQuality, convergingBeamBiasNm, DEFAULT_WAVELENGTH_UNCERTAINTY_NM, type QualityInput } from '@/lib/engine/quality';
import { computeMetrics } from '@/lib/engine/metrics';
import type { CurvePoints } from '@/lib/engine/types';

function gaussian(cwl: number, fwhm: number, step = 0.01, half = 25): CurvePoints {
  const sigma = fwhm / (2 * Math.sqrt(2 * Math.log(2)));
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let l = cwl - half; l <= cwl + half + 1e-9; l += step) {
    wavelengthNm.push(Number(l.toFixed(6)));
    transmission.push(0.9 * Math.exp(-((l - cwl) ** 2) / (2 * sigma * sigma)));
  }
  return { wavelengthNm, transmission };
}

const base = (over: Partial<QualityInput> = {}): QualityInput => ({
  metrics: { cwlNm: 656.3, fwhmNm: 3, medianStepNm: 0.1 },
  method: { instrument: 'spectrophotometer', resolutionNm: 0.2, beam: 'collimated', temperatureC: 21 },
  nEff: 2,
  ...over,
});
const item = (items: ReturnType<typeof assessQuality>, code: string) => items.find((i) => i.code === code)!;

describe('measurement quality', () => {
  it('SBW/FWHM: ≤ 0.1 passes (common practice), above warns, far above fails', () => {
    expect(item(assessQuality(base({ method: { ...base().method, resolutionNm: 0.3 } })), 'bandwidth').level).toBe('pass');
    expect(item(assessQuality(base({ method: { ...base().method, resolutionNm: 0.5 } })), 'bandwidth').level).toBe('warn');
    expect(item(assessQuality(base({ method: { ...base().method, resolutionNm: 1 } })), 'bandwidth').level).toBe('fail');
    expect(item(assessQuality(base({ method: { ...base().method, resolutionNm: undefined } })), 'bandwidth').level).toBe('warn');
  });

  it('the widening it quotes is the Gaussian closed form: convolving widths add in quadrature', () => {
    // Gaussian ⊗ Gaussian is Gaussian with σ² = σ1² + σ2² (a property of the normal distribution)
    const F = 3;
    const S = 0.6;
    const curve = gaussian(656.3, F);
    const sigmaS = S / (2 * Math.sqrt(2 * Math.log(2)));
    const h = 0.01;
    const kernel: number[] = [];
    for (let k = -Math.ceil((5 * sigmaS) / h); k <= Math.ceil((5 * sigmaS) / h); k++) kernel.push(Math.exp(-((k * h) ** 2) / (2 * sigmaS * sigmaS)));
    const ksum = kernel.reduce((a, b) => a + b, 0);
    const half = (kernel.length - 1) / 2;
    const smeared = curve.transmission.map((_, i) => {
      let s = 0;
      for (let k = 0; k < kernel.length; k++) s += kernel[k] * (curve.transmission[i + k - half] ?? 0);
      return s / ksum;
    });
    const measured = computeMetrics({ wavelengthNm: curve.wavelengthNm, transmission: smeared }).fwhmNm!;
    expect(measured).toBeCloseTo(Math.sqrt(F * F + S * S), 2);
    const q = item(assessQuality(base({ metrics: { cwlNm: 656.3, fwhmNm: F, medianStepNm: 0.01 }, method: { ...base().method, resolutionNm: S } })), 'bandwidth');
    expect(q.message).toContain(`${(Math.sqrt(F * F + S * S) - F).toFixed(3)} nm`);
  });

  it('sampling: 10 samples across the FWHM pass, 5 warn, fewer fail', () => {
    const lvl = (step: number) => item(assessQuality(base({ metrics: { cwlNm: 656.3, fwhmNm: 3, medianStepNm: step } })), 'sampling').level;
    expect([lvl(0.3), lvl(0.5), lvl(0.7)]).toEqual(['pass', 'warn', 'fail']);
  });

  it('converging beam: the engine bias matches the small-angle closed form −λ/(16 N² n²)', () => {
    // On axis, a uniformly lit unobstructed pupil has ⟨sin²θ⟩ ≈ 1/(8N²); to first order the CWL moves by
    // −λ·⟨sin²θ⟩/(2 n²) (expanding s(θ) = sqrt(1 − sin²θ/n²), Macleod ch. 2 / the model's first-order law).
    for (const [N, n] of [[4, 2], [3, 1.6], [8, 2.05]]) {
      const bias = convergingBeamBiasNm(gaussian(656.3, 3, 0.01, 20), N, n)!;
      const closed = -656.3 / (16 * N * N * n * n);
      expect(Math.abs(bias - closed) / Math.abs(closed)).toBeLessThan(0.03);
    }
    const items = assessQuality(base({ method: { ...base().method, beam: 'converging', beamFNumber: 4 }, points: gaussian(656.3, 3, 0.01, 20) }));
    const beam = item(items, 'beam');
    expect(beam.correctionNm).toBeGreaterThan(0.6);
    expect(beam.correctionNm).toBeLessThan(0.66);
    expect(beam.level).toBe('warn');
    expect(beam.message).toContain('to the red');
  });

  it('calibration: the declared uncertainty, else the instrument default named as a default', () => {
    const def = item(assessQuality(base()), 'calibration');
    expect(def.message).toContain(`±${DEFAULT_WAVELENGTH_UNCERTAINTY_NM.spectrophotometer.toFixed(2)} nm`);
    expect(def.message).toContain('default');
    const declared = item(assessQuality(base({ method: { ...base().method, wavelengthUncertaintyNm: 0.05 } })), 'calibration');
    expect(declared.level).toBe('pass');
    expect(declared.message).toContain('declared');
    expect(item(assessQuality(base({ metrics: { cwlNm: 656.3, fwhmNm: 1, medianStepNm: 0.05 } })), 'calibration').level).toBe('fail');
  });

  it('temperature: stated at room temperature passes; missing or far warns with the drift', () => {
    expect(item(assessQuality(base()), 'temperature').level).toBe('pass');
    expect(item(assessQuality(base({ method: { ...base().method, temperatureC: undefined }, tempCoeffNmPerC: 0.003 })), 'temperature').message).toContain('0.030 nm');
    const cold = item(assessQuality(base({ method: { ...base().method, temperatureC: -10 }, tempCoeffNmPerC: 0.02 })), 'temperature');
    expect(cold.level).toBe('warn');
    expect(cold.message).toContain('0.600 nm');
  });
});
