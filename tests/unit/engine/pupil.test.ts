import { describe, expect, it } from 'vitest';
import { angleHistogram, buildPupil, marginalRayDeg, pupilWeightBelow } from '@/lib/engine/pupil';
import { angleScale } from '@/lib/engine/cone';
import { EngineInputError } from '@/lib/engine/errors';

const DEG = Math.PI / 180;

describe('angle shift (Macleod, Thin-Film Optical Filters; Smith, Modern Optical Engineering ch. 11)', () => {
  it('relative shift at 10° for n_eff 2.0 is 1 − sqrt(1 − sin²10°/4) = 0.378 %', () => {
    expect((1 - angleScale(10, 2)) * 100).toBeCloseTo(0.378, 3);
  });
  it('a lower effective index shifts more at the same angle', () => {
    expect(1 - angleScale(10, 1.5)).toBeGreaterThan(1 - angleScale(10, 2.2));
  });
});

describe('cone geometry (common practice)', () => {
  it('marginal ray angles on axis, atan(1/2N): f/2.8 ≈ 10.1°, f/1.8 ≈ 15.5°, f/8 ≈ 3.6°', () => {
    expect(marginalRayDeg(2.8)).toBeCloseTo(10.1, 1);
    expect(marginalRayDeg(1.8)).toBeCloseTo(15.5, 1);
    expect(marginalRayDeg(8)).toBeCloseTo(3.6, 1);
  });

  it('the pupil spans the marginal and obstruction-shadow angles on axis', () => {
    const p = buildPupil({ fNumber: 2.8, obstruction: 0.3 });
    expect(p.thetaMaxRad / DEG).toBeCloseTo(10.12, 2);
    expect(p.thetaMinRad / DEG).toBeCloseTo(Math.atan(0.3 / 5.6) / DEG, 6);
  });

  // Closed form for a uniformly lit annulus on axis: the weight inside angle θ is
  // (tan²θ − tan²θmin)/(tan²θmax − tan²θmin), because tanθ = ρ/2N and the weight is ρ dρ.
  for (const [N, eps] of [[2, 0], [2.5, 0.36], [1.8, 0.42], [8.5, 0.3]] as const) {
    it(`on-axis cumulative weight matches the closed form at f/${N}, obstruction ${eps}`, () => {
      const p = buildPupil({ fNumber: N, obstruction: eps });
      const t2min = (eps / (2 * N)) ** 2;
      const t2max = (1 / (2 * N)) ** 2;
      for (let k = 1; k < 20; k++) {
        const theta = p.thetaMinRad + ((p.thetaMaxRad - p.thetaMinRad) * k) / 20;
        const closed = (Math.tan(theta) ** 2 - t2min) / (t2max - t2min);
        expect(pupilWeightBelow(p, theta / DEG)).toBeCloseTo(closed, 10);
      }
      // the stored bins agree with it too
      for (let k = 0; k < p.sin2Edges.length; k++) {
        const theta = Math.asin(Math.sqrt(p.sin2Edges[k]));
        const closed = Math.min(1, Math.max(0, (Math.tan(theta) ** 2 - t2min) / (t2max - t2min)));
        expect(Math.abs(p.cdf[k] - closed)).toBeLessThan(1e-10);
      }
    });
  }

  it('the histogram reproduces the closed form bin by bin and sums to 1', () => {
    const N = 2;
    const eps = 0.3;
    const p = buildPupil({ fNumber: N, obstruction: eps });
    const h = angleHistogram(p, 0.5);
    const t2min = (eps / (2 * N)) ** 2;
    const t2max = (1 / (2 * N)) ** 2;
    const F = (deg: number) => Math.min(1, Math.max(0, (Math.tan(deg * DEG) ** 2 - t2min) / (t2max - t2min)));
    expect(h.reduce((s, b) => s + b.weight, 0)).toBeCloseTo(1, 12);
    for (const b of h) expect(b.weight).toBeCloseTo(F(b.deg + 0.25) - F(b.deg - 0.25), 10);
    expect(h[0].deg).toBe(4.25); // atan(0.3/4) = 4.29°, so the first bin is 4.0–4.5°
    expect(h[h.length - 1].deg).toBe(14.25); // the 14.04° marginal ray lies in the 14.0–14.5° bin
  });

  it('off axis, the histogram agrees with brute-force ray counting over the pupil', () => {
    // Independent count straight from docs/model.md §Pupil: trace d = normalise(c + (ρcosψ e1 + ρsinψ e2)/2N).
    const N = 1.8;
    const eps = 0.3;
    const phi = 12 * DEG;
    const p = buildPupil({ fNumber: N, obstruction: eps, fieldAngleDeg: 12 });
    const h = angleHistogram(p, 1);
    const counts = new Map<number, number>();
    let total = 0;
    const NR = 600;
    const NP = 720;
    for (let i = 0; i < NR; i++) {
      const rho = eps + ((1 - eps) * (i + 0.5)) / NR;
      for (let j = 0; j < NP; j++) {
        const psi = (2 * Math.PI * (j + 0.5)) / NP;
        const t = rho / (2 * N);
        const vx = t * Math.cos(psi);
        const vy = Math.sin(phi) + t * Math.sin(psi) * Math.cos(phi);
        const vz = Math.cos(phi) - t * Math.sin(psi) * Math.sin(phi);
        const theta = Math.acos(vz / Math.hypot(vx, vy, vz)) / DEG;
        const bin = Math.floor(theta) + 0.5;
        counts.set(bin, (counts.get(bin) ?? 0) + rho);
        total += rho;
      }
    }
    for (const b of h) expect(Math.abs(b.weight - (counts.get(b.deg) ?? 0) / total)).toBeLessThan(2e-3);
    expect(p.thetaMaxRad / DEG).toBeCloseTo(12 + Math.atan(1 / 3.6) / DEG, 9);
    expect(p.thetaMinRad).toBe(0); // the chief ray is tilted more than the obstruction shadow: normal incidence occurs
  });

  it('bins carry non-negative weights that sum to 1 for every kind of optic', () => {
    for (const optic of [
      { fNumber: 0.5, obstruction: 0 },
      { fNumber: 3, obstruction: 0.5, fieldAngleDeg: 20, mapping: 'sine' as const },
      { fNumber: 12, obstruction: 0.1, fieldAngleDeg: 1 },
    ]) {
      const p = buildPupil(optic);
      let sum = 0;
      for (const w of p.weights) {
        expect(w).toBeGreaterThanOrEqual(0);
        sum += w;
      }
      expect(sum).toBeCloseTo(1, 12);
    }
  });

  it('is cached per optic', () => {
    expect(buildPupil({ fNumber: 3.3, obstruction: 0.2 })).toBe(buildPupil({ fNumber: 3.3, obstruction: 0.2 }));
  });

  it('refuses impossible optics with a 422 input error', () => {
    const bad = [
      { fNumber: 0.4, obstruction: 0 },
      { fNumber: 2, obstruction: 1 },
      { fNumber: 2, obstruction: -0.1 },
      { fNumber: 2, obstruction: 0, fieldAngleDeg: 60 },
      { fNumber: 0.5, obstruction: 0, fieldAngleDeg: 1, mapping: 'sine' as const },
    ];
    for (const o of bad) {
      let err: unknown;
      try {
        buildPupil(o);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(EngineInputError);
      expect((err as EngineInputError).status).toBe(422);
    }
  });
});
