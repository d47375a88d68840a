import { describe, expect, it } from 'vitest';
import { coneCurve, lineThroughput } from '@/lib/engine/cone';
import { runConeModel } from '@/lib/engine/cone-study';
import { prepareCurve } from '@/lib/engine/curve';
import { airToVacuum } from '@/lib/engine/lines';
import { buildPupil } from '@/lib/engine/pupil';
import { acceptedContinuumNm, boxReference, contrastGain, SKY_LINES, SKY_MODELS, skyLeakage } from '@/lib/engine/sky';
import { flatTop, multiCavity } from './fixtures';

const optic = { fNumber: 2.5, obstruction: 0.36 };

function trapezoid(x: number[], y: number[]) {
  let s = 0;
  for (let i = 1; i < x.length; i++) s += 0.5 * (x[i] - x[i - 1]) * (y[i] + y[i - 1]);
  return s;
}

describe('sky lines', () => {
  it('are standard-air wavelengths: converted to vacuum they match the NIST vacuum values (NIST ASD, from memory; IAU air/vacuum, Morton 2000)', () => {
    const vacuum: Record<string, number> = { 'Hg-546.1': 546.227, 'Na-589.0': 589.158, 'Na-589.6': 589.756, 'OI-557.7': 557.888, 'OI-630.0': 630.204, 'Hg-435.8': 435.956 };
    for (const [id, v] of Object.entries(vacuum)) {
      const l = SKY_LINES.find((x) => x.id === id)!;
      expect(Math.abs(airToVacuum(l.airNm) - v)).toBeLessThan(0.003);
    }
    expect(SKY_LINES.map((l) => l.id)).toHaveLength(9);
  });
});

describe('accepted continuum ∫ T_cone dλ', () => {
  it('on axis equals ∫T · E[s], E[s] by independent midpoint integration over the pupil (uniform in tan²α, s = sqrt(1 − sin²α/n²))', () => {
    const pts = multiCavity(656.8, 5, 3);
    const c = prepareCurve(pts);
    const nEff = 1.9;
    const N = 2.5;
    const eps = 0.36;
    const uIn = (eps / (2 * N)) ** 2;
    const uOut = (1 / (2 * N)) ** 2;
    let es = 0;
    const M = 200_000;
    for (let i = 0; i < M; i++) {
      const u = uIn + ((uOut - uIn) * (i + 0.5)) / M;
      es += Math.sqrt(1 - u / (1 + u) / (nEff * nEff));
    }
    es /= M;
    const got = acceptedContinuumNm(c, buildPupil(optic), { nEff });
    expect(got / c.total / es).toBeCloseTo(1, 8);
  });

  it('off axis agrees with the trapezoid integral of the cone-averaged curve on a fine grid', () => {
    const pts = flatTop(656.5, 6, 0.3, 0.9, 0.02, 25);
    const c = prepareCurve(pts);
    const pupil = buildPupil({ ...optic, fieldAngleDeg: 12 });
    const grid: number[] = [];
    for (let x = 630; x <= 682; x += 0.005) grid.push(x);
    const cone = coneCurve(c, pupil, { nEff: 2 }, grid);
    const direct = trapezoid(cone.wavelengthNm, cone.transmission);
    expect(Math.abs(acceptedContinuumNm(c, pupil, { nEff: 2 }) - direct)).toBeLessThan(1e-4 * direct);
  });
});

describe('contrast gain', () => {
  it('a flat top half as wide with the same line throughput gains √2 under a continuum sky (S/N ∝ τ/√B, Howell, Handbook of CCD Astronomy §4.4)', () => {
    // slow optic so the cone barely matters; continuum only
    const slow = buildPupil({ fNumber: 40, obstruction: 0 });
    const sky = { continuum: 1, lines: {} };
    const wide = prepareCurve(flatTop(656.28, 12, 0.001, 1, 0.01, 20));
    const narrow = prepareCurve(flatTop(656.28, 6, 0.001, 1, 0.01, 20));
    const a = skyLeakage(wide, slow, { nEff: 2 }, 656.28, sky);
    const b = skyLeakage(narrow, slow, { nEff: 2 }, 656.28, sky);
    const ta = lineThroughput(wide, slow, 656.28, { nEff: 2 }).throughput;
    const tb = lineThroughput(narrow, slow, 656.28, { nEff: 2 }).throughput;
    expect(Math.abs(contrastGain(tb, b.background, ta, a.background)! - Math.SQRT2)).toBeLessThan(1e-3);
    // an ideal box as wide as the sampled flat top (6 nm plus one 0.01 nm step of linear edges) is the same filter
    const box = boxReference(6.01, 656.28, sky);
    expect(contrastGain(tb, b.background, box.throughput, box.background)).toBeCloseTo(1, 3);
  });

  it('the reference curve against itself gains exactly 1', () => {
    const pts = multiCavity(656.8, 5, 3);
    const r = runConeModel({ points: pts, optic, nEff: 2, lines: ['Ha'], sky: { model: 'suburban', reference: { points: pts } } });
    expect(r.sky!.gain).toBeCloseTo(1, 12);
    expect(r.sky!.lines).toHaveLength(9);
    expect(r.sky!.continuumNm).toBeGreaterThan(0);
  });
});

describe('sky leakage', () => {
  it('names a sky line the curve does not reach instead of reporting zero', () => {
    const pts = multiCavity(656.8, 5, 3); // 626.8–686.8 nm
    const r = runConeModel({ points: pts, optic, nEff: 2, lines: ['Ha'], sky: { model: 'suburban' } });
    const hg = r.sky!.lines.find((l) => l.id === 'Hg-546.1')!;
    expect(hg.throughput).toBeNull();
    expect(hg.covered).toBe(false);
    expect(r.warnings.join(' ')).toMatch(/does not reach .*Hg 546\.1.* nm, so their leakage is unknown/);
    const oi = r.sky!.lines.find((l) => l.id === 'OI-636.4')!;
    expect(oi.covered).toBe(true);
    expect(oi.throughput).toBeGreaterThanOrEqual(0);
  });

  it('says so when the target line is itself a sky line, and keeps it out of the background', () => {
    const pts = multiCavity(630.5, 3, 3);
    const model = { continuum: 1, lines: { 'OI-630.0': 1000 } };
    const r = runConeModel({ points: pts, optic, nEff: 2, lines: ['OI'], sky: { model } });
    const line = r.sky!.lines.find((l) => l.id === 'OI-630.0')!;
    expect(line.isTarget).toBe(true);
    expect(r.warnings.join(' ')).toMatch(/itself the sky line \[O I\] 630\.0/);
    // the background is only the continuum (and 636.4 at strength 0)
    expect(r.sky!.background).toBeCloseTo(r.sky!.continuumNm, 10);
  });

  it('ships dark, suburban and LED-town models labelled as illustrative', () => {
    expect(SKY_MODELS.map((m) => m.id)).toEqual(['dark', 'suburban', 'led-town']);
    for (const m of SKY_MODELS) expect(m.basis).toMatch(/Illustrative/);
  });

  it('refuses an unknown sky model or line naming the field', () => {
    const pts = multiCavity(656.8, 5, 3);
    expect(() => runConeModel({ points: pts, optic, nEff: 2, sky: { model: 'city' } })).toThrow(/Unknown sky model/);
    try {
      runConeModel({ points: pts, optic, nEff: 2, sky: { model: { continuum: 1, lines: { 'Xe-1': 3 } } } });
      throw new Error('accepted');
    } catch (e) {
      expect((e as { details: { field: string }[] }).details[0].field).toBe('sky.model.lines.Xe-1');
    }
  });
});
