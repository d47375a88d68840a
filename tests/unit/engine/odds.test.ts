import { describe, expect, it } from 'vitest';
import { lineThroughput } from '@/lib/engine/cone';
import { buildPupil } from '@/lib/engine/pupil';
import { erf, normalCdf, oddsSentence, unitOdds } from '@/lib/engine/odds';
import { flatTop, multiCavity, rng } from './fixtures';

describe('normal distribution', () => {
  it('erf matches the handbook values (Abramowitz & Stegun, Table 7.1)', () => {
    expect(erf(0.5)).toBeCloseTo(0.5204998778, 6);
    expect(erf(1)).toBeCloseTo(0.8427007929, 6);
    expect(erf(2)).toBeCloseTo(0.9953222650, 6);
    expect(normalCdf(1.959964)).toBeCloseTo(0.975, 6);
  });
});

describe('odds for a buyer', () => {
  it('boxes of one width with a normal CWL spread: P = Φ((λ + w/2 − μ)/σ) − Φ((λ − w/2 − μ)/σ) (closed form)', () => {
    // slow optic and n_eff 4, so the cone barely moves the passband; flat tops 4 nm wide, sharp edges
    const pupil = buildPupil({ fNumber: 30, obstruction: 0 });
    const centres = [656.0, 657.4, 655.1, 656.9, 658.0, 655.6];
    const units = centres.map((c) => ({ points: flatTop(c, 4, 0.001, 1, 0.005, 15), nEff: 4 }));
    const r = unitOdds({ units, pupil, lineNm: 656.28, minThroughput: 0.5 });
    const mu = r.cwlSpreadNm.mean!;
    const sd = r.cwlSpreadNm.sd!;
    expect(r.fwhmSpreadNm.sd!).toBeLessThan(1e-6);
    const w = r.fwhmSpreadNm.mean!;
    const expected = normalCdf((656.28 + w / 2 - mu) / sd) - normalCdf((656.28 - w / 2 - mu) / sd);
    expect(Math.abs(r.probability! - expected)).toBeLessThan(0.005);
    // counted: units whose box holds the line
    expect(r.meeting).toBe(centres.filter((c) => Math.abs(c - 656.28) < 2).length);
    expect(r.units).toBe(6);
  });

  it('agrees with an independent Monte Carlo over the fitted normals (4000 draws, each unit built and run through the cone model)', () => {
    const pupil = buildPupil({ fNumber: 2.5, obstruction: 0.36 });
    const specs = [
      [657.1, 5.2], [656.6, 4.7], [657.9, 5.5], [656.9, 4.9], [657.4, 5.0], [658.2, 5.6], [656.3, 4.6],
    ];
    const units = specs.map(([c, w], i) => ({ points: multiCavity(c, w, 3, { seed: i + 1 }), nEff: 2.05 }));
    const X = 0.7;
    const r = unitOdds({ units, pupil, lineNm: 656.28, minThroughput: X });
    const tpl = specs[r.templateIndex!];
    const [cM, cS, wM, wS] = [r.cwlSpreadNm.mean!, r.cwlSpreadNm.sd!, r.fwhmSpreadNm.mean!, r.fwhmSpreadNm.sd!];
    // the template's own half-maximum centre and width as the engine measured them
    const ct = tpl[0];
    const wt = tpl[1];
    const rand = rng(42);
    const gauss = () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    const base = units[r.templateIndex!].points;
    let hits = 0;
    const N = 4000;
    for (let k = 0; k < N; k++) {
      const c = cM + cS * gauss();
      const w = wM + wS * gauss();
      const pts = { wavelengthNm: base.wavelengthNm.map((x) => c + (x - ct) * (w / wt)), transmission: base.transmission };
      if (lineThroughput(pts, pupil, 656.28, { nEff: 2.05 }).throughput >= X) hits++;
    }
    const mc = hits / N;
    expect(r.probability!).toBeGreaterThan(0.05);
    expect(r.probability!).toBeLessThan(0.95);
    expect(Math.abs(r.probability! - mc)).toBeLessThan(0.03);
  }, 60_000);

  it('with fewer than three units gives no probability and says why', () => {
    const pupil = buildPupil({ fNumber: 2.5, obstruction: 0.36 });
    const r = unitOdds({ units: [{ points: multiCavity(657, 5), nEff: 2 }, { points: multiCavity(657.5, 5), nEff: 2 }], pupil, lineNm: 656.28, minThroughput: 0.8 });
    expect(r.probability).toBeNull();
    expect(r.reason).toMatch(/Only 2 measured units/);
    expect(oddsSentence(r)).toMatch(/^\d of 2 measured units; Only 2/);
  });

  it('states the sample plainly', () => {
    expect(oddsSentence({ units: 9, meeting: 7, probability: 0.8, reason: undefined })).toBe('7 of 9 measured units; about 80 % of units, from 9 measurements');
  });
});
