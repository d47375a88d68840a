import { describe, expect, it } from 'vitest';
import { buildDemoWorld, mulberry32, type DemoCurve } from '@/seeds/world';
import {
  computeFitnessGrid,
  defaultNEff,
  fitnessWeights,
  interpolate,
  offNormalThroughput,
  offNormalCoefficients,
  applyOffNormal,
  fineSliceBounds,
  opticOf,
  DEFAULT_N_EFF,
  RUN_TOLERANCE,
  type FitnessQuery,
} from '@/lib/catalogue/fitness-grid';
import { buildPupil } from '@/lib/engine/pupil';
import { lineThroughput } from '@/lib/engine/cone';
import { findLine } from '@/lib/engine/lines';
import { GRID_ERROR } from '@/lib/catalogue/grid-accuracy';

const world = buildDemoWorld();
const verified = world.curves.filter((c) => c.status === 'verified');
const grids = new Map(verified.map((c) => [c.key, computeFitnessGrid({ points: c.points, aoiDeg: c.method.aoiDeg, nEff: c.trueNEff ?? null, lines: c.lines })]));

/**
 * τ straight from the definition in docs/model.md §Pupil and §Throughput, written here without the
 * engine: a uniformly lit annular pupil, each point's ray from the tangent
 * mapping, its incidence angle, the passband scaled by s(θ), and the
 * ρ dρ dψ-weighted mean by the midpoint rule in u = ρ² (where the weight is even).
 */
function definitionTau(c: DemoCurve, lambda: number, q: Required<FitnessQuery>, nu = 360, npsi = 360): number {
  const { wavelengthNm: x, transmission: y } = c.points;
  const T = (v: number) => {
    if (v < x[0] || v > x[x.length - 1]) return 0;
    let lo = 0;
    let hi = x.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (x[mid] <= v) lo = mid;
      else hi = mid;
    }
    return y[lo] + ((y[hi] - y[lo]) * (v - x[lo])) / (x[hi] - x[lo]);
  };
  const n = q.nEff;
  const phi = (q.fieldAngleDeg * Math.PI) / 180;
  const sm = Math.sqrt(1 - Math.sin((c.method.aoiDeg * Math.PI) / 180) ** 2 / (n * n));
  const e2 = q.obstruction ** 2;
  let sum = 0;
  for (let i = 0; i < nu; i++) {
    const rho = Math.sqrt(e2 + ((1 - e2) * (i + 0.5)) / nu);
    for (let k = 0; k < npsi; k++) {
      const psi = (2 * Math.PI * (k + 0.5)) / npsi;
      // c = (0, sin φ, cos φ), e1 = (1, 0, 0), e2 = (0, cos φ, −sin φ)
      const a = (rho * Math.cos(psi)) / (2 * q.fNumber);
      const b = (rho * Math.sin(psi)) / (2 * q.fNumber);
      const dx = a;
      const dy = Math.sin(phi) + b * Math.cos(phi);
      const dz = Math.cos(phi) - b * Math.sin(phi);
      const cos = dz / Math.hypot(dx, dy, dz);
      const s = Math.sqrt(1 - (1 - cos * cos) / (n * n));
      sum += T((sm * lambda) / s);
    }
  }
  return sum / (nu * npsi);
}

function optics(seed: number, count: number, mode: 'axis' | 'neff' | 'field'): FitnessQuery[] {
  const rnd = mulberry32(seed);
  return Array.from({ length: count }, () => {
    const q: FitnessQuery = { fNumber: 1 + rnd() * 9, obstruction: rnd() * 0.6 };
    if (mode === 'neff') q.nEff = 1.3 + rnd() * 1.5;
    if (mode === 'field') q.fieldAngleDeg = rnd() * 25;
    return q;
  });
}

describe('fitness grid against the definition of line throughput (docs/model.md §Pupil and §Throughput)', () => {
  // Narrow, pre-shifted, wide, dual-band and off-normal units: the cases where interpolation could go wrong.
  const picks = ['Vantrell Quillon Hα 2.5nm', 'Tessaly & Hume Corvelle Hα 2.8nm', 'Ostrowen Wideleaf OIII 10nm', 'Brisquenne Leewing Hα 4.5nm']
    .map((label) => verified.find((c) => c.label === label && c.method.aoiDeg === 0))
    .filter((c): c is DemoCurve => !!c);
  const offNormal = verified.find((c) => c.method.aoiDeg > 0 && c.trueNEff);

  it('agrees with a direct pupil integration within the documented error', () => {
    expect(picks.length).toBe(4);
    const cases: [DemoCurve, Required<FitnessQuery>][] = [];
    for (const c of picks) {
      cases.push([c, { fNumber: 2.5, obstruction: 0.36, nEff: DEFAULT_N_EFF, fieldAngleDeg: 0 }]);
      cases.push([c, { fNumber: 1.6, obstruction: 0, nEff: 1.8, fieldAngleDeg: 0 }]);
      cases.push([c, { fNumber: 3.2, obstruction: 0.28, nEff: 2.1, fieldAngleDeg: 8 }]);
    }
    let worst = 0;
    for (const [c, q] of cases) {
      const line = findLine(c.lines[0])!.airNm;
      const row = grids.get(c.key)!.find((r) => r.lineId === c.lines[0])!;
      const grid = interpolate(row, fitnessWeights(q));
      const direct = definitionTau(c, line, q);
      worst = Math.max(worst, Math.abs(grid - direct));
      // the midpoint rule itself is good to about 1e-3 here; the grid adds its documented error
      expect(Math.abs(grid - direct)).toBeLessThanOrEqual(GRID_ERROR.max + 2e-3);
    }
    expect(worst).toBeGreaterThan(0); // a real comparison, not two copies of one number
  });

  it('reads an off-normal curve at its own fitted n_eff when the search names none', () => {
    expect(offNormal).toBeDefined();
    const c = offNormal!;
    const row = grids.get(c.key)!.find((r) => r.lineId === c.lines[0])!;
    expect(row.canonical).not.toBeNull();
    const q = { fNumber: 2, obstruction: 0.3 };
    const grid = interpolate(row, fitnessWeights(q));
    const direct = definitionTau(c, findLine(c.lines[0])!.airNm, { ...q, nEff: c.trueNEff!, fieldAngleDeg: 0 });
    expect(Math.abs(grid - direct)).toBeLessThanOrEqual(GRID_ERROR.max + 2e-3);
  });
});

describe('fitness grid accuracy over the demo world (the README figure)', () => {
  function measure(mode: 'axis' | 'neff' | 'field', seed: number) {
    let max = 0;
    let sum = 0;
    let n = 0;
    for (const q of optics(seed, 60, mode)) {
      const pupil = buildPupil(opticOf(q));
      const w = fitnessWeights(q, pupil);
      for (const c of verified) {
        for (const row of grids.get(c.key)!) {
          const exact = lineThroughput(c.points, pupil, findLine(row.lineId)!.airNm, { nEff: q.nEff ?? defaultNEff(c.trueNEff), measuredAoiDeg: c.method.aoiDeg }).throughput;
          // off-normal curves under a named n_eff are summed per curve (their frame depends on n_eff), the rest in SQL
          const fromGrid = q.nEff !== undefined && c.method.aoiDeg > 0 ? offNormalThroughput(row.fine!, c.method.aoiDeg, q.nEff, pupil) : interpolate(row, w);
          const e = Math.abs(fromGrid - exact);
          max = Math.max(max, e);
          sum += e;
          n++;
        }
      }
    }
    return { max, mean: sum / n, n };
  }

  it.each([
    ['axis', 'on axis, each curve at its own n_eff'],
    ['neff', 'on axis, a named n_eff between 1.3 and 2.8'],
    ['field', 'off axis, field angles up to 25°'],
  ] as const)('%s: %s', { timeout: 60_000 }, (mode, _what) => {
    const r = measure(mode, 20261202);
    console.log(`fitness grid vs engine (${mode}): max ${r.max.toFixed(4)}, mean ${r.mean.toFixed(5)} over ${r.n} curve-line-optic cases`);
    expect(r.max).toBeLessThanOrEqual(GRID_ERROR[mode]);
    expect(r.n).toBeGreaterThan(3000);
  });
});

describe('off-normal curves under a named n_eff', () => {
  it('need only the stretch of their fine level that the search reads', () => {
    const offNormal = verified.filter((c) => c.method.aoiDeg > 0);
    expect(offNormal.length).toBeGreaterThan(3);
    for (const q of optics(5, 8, 'neff')) {
      const pupil = buildPupil(opticOf(q));
      for (const c of offNormal) {
        const fine = grids.get(c.key)![0].fine!;
        const { first, last } = fineSliceBounds(q.nEff!, pupil, c.method.aoiDeg);
        const whole = offNormalThroughput(fine, c.method.aoiDeg, q.nEff!, pupil);
        expect(offNormalThroughput(fine.slice(first, last + 1), c.method.aoiDeg, q.nEff!, pupil, first)).toBe(whole);
      }
    }
  });
});

describe('off-normal coefficients', () => {
  it('give what offNormalThroughput gives, for every stored curve and for arbitrary stored sums', () => {
    const offNormal = verified.filter((c) => c.method.aoiDeg > 0);
    let checked = 0;
    for (const q of optics(7, 6, 'neff')) {
      const pupil = buildPupil(opticOf(q));
      for (const c of offNormal) {
        const k = offNormalCoefficients(c.method.aoiDeg, q.nEff!, pupil);
        const fine = grids.get(c.key)![0].fine!;
        // linearity is what makes the shortcut exact; a made-up level checks it beyond real curves
        const made = Int32Array.from(fine, (_, j) => Math.round(j * 7000 + 3000 * Math.sin(j / 5)));
        for (const stored of [fine, made]) {
          const direct = offNormalThroughput(stored, c.method.aoiDeg, q.nEff!, pupil);
          expect(Math.abs(applyOffNormal(k, stored) - direct)).toBeLessThan(1e-9 * Math.max(1, Math.abs(direct)));
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(20);
  });
});

describe('fitness weights', () => {
  it('share out all of the pupil’s light, and merging stays within its budget', () => {
    for (const q of [...optics(1, 20, 'axis'), ...optics(2, 20, 'field')]) {
      const w = fitnessWeights(q);
      const light = w.mass.reduce((s, m) => s + m, 0) + w.beyond;
      expect(light).toBeCloseTo(1, 9);
      expect(w.mergeError).toBeLessThanOrEqual(RUN_TOLERANCE + 1e-12);
      expect(w.terms.length).toBeGreaterThan(0);
    }
  });

  it('give a flat curve its own transmission back', () => {
    const flat = { wavelengthNm: [300, 500, 700, 900, 1100], transmission: [0.7, 0.7, 0.7, 0.7, 0.7] };
    const [row] = computeFitnessGrid({ points: flat, aoiDeg: 0, nEff: null, lines: ['Ha'] });
    for (const q of optics(3, 10, 'field')) expect(interpolate(row, fitnessWeights(q))).toBeCloseTo(0.7, 3);
  });
});
