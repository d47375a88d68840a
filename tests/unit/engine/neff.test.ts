import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fitEffectiveIndex, predictCwl } from '@/lib/engine/neff';
import { EngineInputError } from '@/lib/engine/errors';
import { computeMetrics } from '@/lib/engine/metrics';
import { multiCavity } from './fixtures';

describe('effective index fit (docs/model.md §Effective index; thin-film angle shift after Macleod)', () => {
  it('recovers a known n_eff and λ0 from exact synthetic (AOI, CWL) pairs', () => {
    const pairs = [0, 5, 10, 15, 20].map((a) => ({ aoiDeg: a, cwlNm: predictCwl(656.5, 2.05, a) }));
    const fit = fitEffectiveIndex(pairs);
    expect(fit.nEff).toBeCloseTo(2.05, 9);
    expect(fit.cwl0Nm).toBeCloseTo(656.5, 9);
    expect(fit.rmsResidualNm).toBeLessThan(1e-9);
    expect(fit.points).toHaveLength(5);
  });

  it('recovers n_eff from any plausible filter and angle set (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1.3, max: 3.5, noNaN: true }),
        fc.double({ min: 380, max: 1000, noNaN: true }),
        fc.uniqueArray(fc.integer({ min: 0, max: 40 }), { minLength: 2, maxLength: 6 }),
        (n, cwl, angles) => {
          const fit = fitEffectiveIndex(angles.map((a) => ({ aoiDeg: a, cwlNm: predictCwl(cwl, n, a) })));
          expect(fit.nEff).toBeCloseTo(n, 5);
          expect(fit.cwl0Nm).toBeCloseTo(cwl, 6);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('recovers n_eff from CWLs measured on whole synthetic curves, with a small residual', () => {
    const n = 1.85;
    const set = [0, 6, 12, 18].map((a) => {
      const s = Math.sqrt(1 - Math.sin((a * Math.PI) / 180) ** 2 / n ** 2);
      const base = multiCavity(500.7, 3, 3, { noise: 0.004, seed: a + 1, step: 0.02, half: 15 });
      return { aoiDeg: a, cwlNm: computeMetrics({ wavelengthNm: base.wavelengthNm.map((x) => x * s), transmission: base.transmission }).cwlNm! };
    });
    const fit = fitEffectiveIndex(set);
    expect(fit.nEff).toBeGreaterThan(1.8);
    expect(fit.nEff).toBeLessThan(1.9);
    expect(fit.rmsResidualNm).toBeLessThan(0.02);
  });

  it('refuses a set that moves redward with angle (422)', () => {
    let err: unknown;
    try {
      fitEffectiveIndex([
        { aoiDeg: 0, cwlNm: 656 },
        { aoiDeg: 10, cwlNm: 657 },
      ]);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(EngineInputError);
    expect((err as EngineInputError).status).toBe(422);
    expect((err as Error).message).toMatch(/do not move blueward with angle/);
  });

  it('refuses fewer than two distinct angles', () => {
    expect(() => fitEffectiveIndex([{ aoiDeg: 5, cwlNm: 656 }, { aoiDeg: 5, cwlNm: 655.9 }])).toThrow(/two or more different angles/);
    expect(() => fitEffectiveIndex([])).toThrow(EngineInputError);
  });

  it('refuses impossible values', () => {
    expect(() => fitEffectiveIndex([{ aoiDeg: -1, cwlNm: 656 }, { aoiDeg: 5, cwlNm: 655 }])).toThrow(EngineInputError);
    expect(() => fitEffectiveIndex([{ aoiDeg: 0, cwlNm: 0 }, { aoiDeg: 5, cwlNm: 655 }])).toThrow(EngineInputError);
  });

  it('predictCwl is the §3 scale: 10° at n_eff 2 moves 656.28 nm by 0.378 %', () => {
    expect((1 - predictCwl(656.28, 2, 10) / 656.28) * 100).toBeCloseTo(0.378, 3);
    expect(predictCwl(656.28, 2, 0)).toBe(656.28);
  });
});
