import { describe, expect, it } from 'vitest';
import { angleScale, lineThroughput } from '@/lib/engine/cone';
import { buildPupil } from '@/lib/engine/pupil';
import { prepareCurve } from '@/lib/engine/curve';
import type { Optic } from '@/lib/engine/types';
import { bruteForceTaus, flatTop, gaussian, multiCavity } from './fixtures';

describe('convergence: production quadrature within 1e-4 of brute-force integration (docs/model.md §Accuracy)', () => {
  // Brute force: midpoint rule over the pupil (4000 × 4000 off axis, 200 000 radial
  // nodes on axis), tracing each ray as docs/model.md §Pupil defines it.
  const curves = {
    gaussian: gaussian(656.9, 1.3),
    'flat-top, 0.05 nm edges': flatTop(657.2, 4, 0.05, 0.95, 0.01, 12),
    'noisy 3-cavity': multiCavity(657.5, 5, 3, { ripple: 0.02, noise: 0.01, seed: 3 }),
  };
  const optics: Optic[] = [
    { fNumber: 2, obstruction: 0 },
    { fNumber: 2.4, obstruction: 0.45 },
    { fNumber: 1.4, obstruction: 0.3, fieldAngleDeg: 15 },
    { fNumber: 3, obstruction: 0.2, fieldAngleDeg: 10, mapping: 'sine' },
    { fNumber: 4, obstruction: 0.35, fieldAngleDeg: 20 },
    { fNumber: 0.9, obstruction: 0, fieldAngleDeg: 5 },
  ];
  for (const [name, pts] of Object.entries(curves)) {
    const c = prepareCurve(pts);
    for (const optic of optics) {
      it(`${name} through ${JSON.stringify(optic)}`, () => {
        const pupil = buildPupil(optic);
        const onAxis = !optic.fieldAngleDeg;
        const lambdas = [654.5, 656.28, 658.35];
        const refs = bruteForceTaus(pts, optic, lambdas, 1.9, onAxis ? { nRho: 200_000 } : { nRho: 4000, nPsi: 4000 });
        let worst = 0;
        lambdas.forEach((lam, k) => {
          const tau = lineThroughput(c, pupil, lam, { nEff: 1.9 }).throughput;
          worst = Math.max(worst, Math.abs(tau - refs[k]));
        });
        expect(worst).toBeLessThan(1e-4);
      }, 120_000);
    }
  }

  it('holds with a measurement AOI and a pre-shift in the frame', () => {
    const pts = multiCavity(659, 3, 2, { noise: 0.005, seed: 9 });
    const optic = { fNumber: 1.8, obstruction: 0.25, fieldAngleDeg: 8 };
    const pupil = buildPupil(optic);
    const params = { nEff: 2.1, measuredAoiDeg: 7, preShiftNm: 0.6 };
    const sM = angleScale(7, 2.1);
    const lambdas = [655.9, 656.28, 657.4];
    const refs = bruteForceTaus(pts, optic, lambdas, 2.1, { sM, shift: 0.6 });
    lambdas.forEach((lam, k) => {
      const tau = lineThroughput(pts, pupil, lam, params).throughput;
      expect(Math.abs(tau - refs[k])).toBeLessThan(1e-4);
    });
  }, 120_000);
});


describe('convergence at the edges of the accepted range', () => {
  // very fast cones, large field angles and 0.02 nm filter edges
  const steep = flatTop(650, 20, 0.02, 0.95, 0.01, 45);
  const extreme: Optic[] = [
    { fNumber: 0.5, obstruction: 0 },
    { fNumber: 0.6, obstruction: 0.2, fieldAngleDeg: 30 },
    { fNumber: 1, obstruction: 0.5, fieldAngleDeg: 40, mapping: 'sine' },
  ];
  for (const optic of extreme) {
    it(`steep flat-top through ${JSON.stringify(optic)}`, () => {
      const lambdas = [630, 645, 652, 659, 662];
      const refs = bruteForceTaus(steep, optic, lambdas, 1.6, optic.fieldAngleDeg ? {} : { nRho: 400_000 });
      const pupil = buildPupil(optic);
      lambdas.forEach((lam, k) => {
        expect(Math.abs(lineThroughput(steep, pupil, lam, { nEff: 1.6 }).throughput - refs[k])).toBeLessThan(1e-4);
      });
    }, 120_000);
  }
});

describe('the convergence check can tell a coarse quadrature apart', () => {
  it('an 8-bin pupil misses the 1e-4 bound that the production pupil meets', () => {
    const pts = flatTop(657.2, 4, 0.05, 0.95, 0.01, 12);
    const optic = { fNumber: 1.4, obstruction: 0.3, fieldAngleDeg: 15 };
    const [ref] = bruteForceTaus(pts, optic, [654.5], 1.9);
    const coarse = lineThroughput(pts, buildPupil(optic, { bins: 8 }), 654.5, { nEff: 1.9 }).throughput;
    const fine = lineThroughput(pts, buildPupil(optic), 654.5, { nEff: 1.9 }).throughput;
    expect(Math.abs(coarse - ref)).toBeGreaterThan(1e-4);
    expect(Math.abs(fine - ref)).toBeLessThan(1e-4);
  }, 120_000);
});
