import { describe, expect, it } from 'vitest';
import { fitEffectiveIndex, predictCwl } from '@/lib/engine/neff';

/** A small deterministic Gaussian source (Box–Muller over a 32-bit LCG, Numerical Recipes constants). */
function gaussian(seed: number) {
  let s = seed >>> 0;
  const u = () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return (s + 0.5) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

describe('standard error of a fitted n_eff (lib/engine/neff.ts)', () => {
  it('matches the scatter of n_eff over many noisy sets (Monte Carlo, the sampling distribution itself)', () => {
    const angles = [0, 4, 8, 12, 16];
    const truth = { n: 1.9, cwl: 656.3 };
    const sigmaNm = 0.02;
    const g = gaussian(12345);
    const fitted: number[] = [];
    const reported: number[] = [];
    for (let k = 0; k < 4000; k++) {
      const f = fitEffectiveIndex(angles.map((a) => ({ aoiDeg: a, cwlNm: predictCwl(truth.cwl, truth.n, a) + sigmaNm * g() })));
      fitted.push(f.nEff);
      reported.push(f.nEffStdErr!);
    }
    const mean = fitted.reduce((s, v) => s + v, 0) / fitted.length;
    const sd = Math.sqrt(fitted.reduce((s, v) => s + (v - mean) ** 2, 0) / (fitted.length - 1));
    // the root-mean-square reported error against the observed spread: within 10 %
    const rms = Math.sqrt(reported.reduce((s, v) => s + v * v, 0) / reported.length);
    expect(Math.abs(rms / sd - 1)).toBeLessThan(0.1);
    console.log(`n_eff scatter ${sd.toFixed(5)}, reported RMS standard error ${rms.toFixed(5)}`);
    expect(sd).toBeGreaterThan(0.001);
  });

  it('is null with two curves and zero for an exact set', () => {
    expect(fitEffectiveIndex([{ aoiDeg: 0, cwlNm: 656 }, { aoiDeg: 10, cwlNm: 654 }]).nEffStdErr).toBeNull();
    const exact = fitEffectiveIndex([0, 10, 20].map((a) => ({ aoiDeg: a, cwlNm: predictCwl(656, 2, a) })));
    expect(exact.nEffStdErr!).toBeLessThan(1e-6);
  });
});
