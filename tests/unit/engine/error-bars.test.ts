import { describe, expect, it } from 'vitest';
import { runConeModel } from '@/lib/engine/cone-study';

// A trapezoid passband: flat 0.9 between 655 and 658 nm, straight edges 1 nm wide.
function trapezoid() {
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let i = 0; i <= 4000; i++) {
    const l = 646 + i * 0.005;
    wavelengthNm.push(Number(l.toFixed(3)));
    const t = l < 654 || l > 659 ? 0 : l < 655 ? 0.9 * (l - 654) : l > 658 ? 0.9 * (659 - l) : 0.9;
    transmission.push(t);
  }
  return { wavelengthNm, transmission };
}

describe('error bars: throughputRange from the wavelength and n_eff uncertainties', () => {
  const points = trapezoid();
  const slow = { fNumber: 40, obstruction: 0 };

  it('on a straight edge in a near-collimated beam the range is the closed form T(λ − u)…T(λ + u) of the edge', () => {
    // line on the red edge at 658.5 nm: T = 0.9·(659 − λ); a +u wavelength error moves the curve red (more light)
    // On a straight edge the cone average of T(λ·g − Δ) is T(λ·⟨g⟩ − Δ) exactly; ⟨g⟩ = ⟨1/s(θ)⟩ over the pupil,
    // on axis with the tangent mapping sin²θ = U/(1 + U), U uniform in [0, 1/(4N²)] (midpoint rule below).
    const N = 40;
    const n = 2;
    let gMean = 0;
    const M = 20000;
    for (let i = 0; i < M; i++) {
      const U = ((i + 0.5) / M) / (4 * N * N);
      gMean += 1 / Math.sqrt(1 - U / (1 + U) / (n * n)) / M;
    }
    const u = 0.2;
    const lam = 658.5;
    const r = runConeModel({ points, optic: slow, nEff: n, lineNm: lam, wavelengthUncertaintyNm: u });
    const [lo, hi] = r.lines[0].throughputRange!;
    expect(lo).toBeCloseTo(0.9 * (659 - lam * gMean - u), 6);
    expect(hi).toBeCloseTo(0.9 * (659 - lam * gMean + u), 6);
    expect(lo).toBeLessThanOrEqual(r.lines[0].throughput);
    expect(hi).toBeGreaterThanOrEqual(r.lines[0].throughput);
    // the speed-equivalent f-number N·sqrt(T_peak/τ) at each end
    const [fast, slowEnd] = r.lines[0].speedEquivalentRange!;
    expect(fast!).toBeCloseTo(40 * Math.sqrt(0.9 / hi), 6);
    expect(slowEnd!).toBeCloseTo(40 * Math.sqrt(0.9 / lo), 6);
    // the best pre-shift moves one for one with a wavelength error
    expect(r.bestPreShift!.nmRange![1] - r.bestPreShift!.nmRange![0]).toBeCloseTo(2 * u, 6);
  });

  it('a line on the flat top keeps its throughput within a small wavelength error', () => {
    const r = runConeModel({ points, optic: slow, nEff: 2, lineNm: 656.5, wavelengthUncertaintyNm: 0.3 });
    const [lo, hi] = r.lines[0].throughputRange!;
    expect(hi - lo).toBeLessThan(1e-6);
  });

  it('an n_eff uncertainty widens the range in a fast cone; without uncertainties there is no range', () => {
    const fast = { fNumber: 2.5, obstruction: 0.36 };
    const a = runConeModel({ points, optic: fast, nEff: 1.9, lineNm: 656.5, nEffUncertainty: 0.1 });
    const b = runConeModel({ points, optic: fast, nEff: 1.9, lineNm: 656.5 });
    expect(b.lines[0].throughputRange).toBeUndefined();
    const [lo, hi] = a.lines[0].throughputRange!;
    expect(hi).toBeGreaterThan(lo);
    // a smaller n_eff shifts further blue: the range's ends are the model at n ∓ σ
    const lower = runConeModel({ points, optic: fast, nEff: 1.8, lineNm: 656.5 }).lines[0].throughput;
    const higher = runConeModel({ points, optic: fast, nEff: 2.0, lineNm: 656.5 }).lines[0].throughput;
    expect(lo).toBeCloseTo(Math.min(lower, higher, b.lines[0].throughput), 12);
    expect(hi).toBeCloseTo(Math.max(lower, higher, b.lines[0].throughput), 12);
  });
});
