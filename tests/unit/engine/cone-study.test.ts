import { describe, expect, it } from 'vitest';
import { runConeModel } from '@/lib/engine/cone-study';
import { lineThroughput } from '@/lib/engine/cone';
import { buildPupil } from '@/lib/engine/pupil';
import { EngineInputError } from '@/lib/engine/errors';
import { dopplerShift } from '@/lib/engine/lines';
import { multiCavity } from './fixtures';

const ha = multiCavity(656.28, 3, 3, { peak: 0.93, noise: 0.002, seed: 4 });
const base = { points: ha, optic: { fNumber: 2.5, obstruction: 0.36 }, nEff: 2.05 };

describe('runConeModel: the POST /api/model/cone response (docs/api.md)', () => {
  it('returns exactly the documented fields', () => {
    const r = runConeModel({ ...base, lines: ['Ha'] });
    expect(Object.keys(r).sort()).toEqual(['angleHistogram', 'bestPreShift', 'contrast', 'lines', 'neighbours', 'warnings']);
    expect(Object.keys(r.lines[0]).sort()).toEqual(['collimated', 'id', 'speedEquivalentFNumber', 'throughput', 'wavelengthNm']);
    expect(Object.keys(r.neighbours[0]).sort()).toEqual(['collimated', 'id', 'throughput', 'wavelengthNm']);
    expect(Object.keys(r.bestPreShift!).sort()).toEqual(['nm', 'throughput']);
    expect(Object.keys(r.angleHistogram[0]).sort()).toEqual(['deg', 'weight']);
    expect(r.lines[0].id).toBe('Ha');
    expect(r.neighbours.map((n) => n.id).sort()).toEqual(['NII-655', 'NII-658']);
    const json = JSON.parse(JSON.stringify(r));
    expect(json).toEqual(r); // nothing that JSON cannot carry (no Infinity, NaN or typed arrays)
  });

  it('agrees with the building blocks it is made of', () => {
    const r = runConeModel({ ...base, lines: ['Ha'], preShiftNm: 0.3 });
    const pupil = buildPupil(base.optic);
    const one = lineThroughput(ha, pupil, 656.28, { nEff: 2.05, preShiftNm: 0.3 });
    expect(r.lines[0].throughput).toBeCloseTo(one.throughput, 12);
    expect(r.lines[0].collimated).toBeCloseTo(one.collimated, 12);
    const peak = Math.max(...ha.transmission);
    // N_eq = N · sqrt(T_peak / τ) (docs/model.md §Throughput)
    expect(r.lines[0].speedEquivalentFNumber).toBeCloseTo(2.5 * Math.sqrt(peak / one.throughput), 10);
    expect(r.bestPreShift!.throughput).toBeGreaterThanOrEqual(one.throughput);
    expect(r.angleHistogram.reduce((s, b) => s + b.weight, 0)).toBeCloseTo(1, 10);
  });

  it('includes the cone-averaged curve only when asked, and contrast = τ / effective bandwidth of that curve', () => {
    expect(runConeModel({ ...base, lines: ['Ha'] }).coneCurve).toBeUndefined();
    const r = runConeModel({ ...base, lines: ['Ha'], includeCurve: true });
    const c = r.coneCurve!;
    expect(Object.keys(c).sort()).toEqual(['transmission', 'wavelengthNm']);
    let area = 0;
    for (let i = 1; i < c.wavelengthNm.length; i++) area += 0.5 * (c.wavelengthNm[i] - c.wavelengthNm[i - 1]) * (c.transmission[i] + c.transmission[i - 1]);
    const w = area / Math.max(...c.transmission);
    expect(r.contrast).toBeCloseTo(r.lines[0].throughput / w, 10);
  });

  it('gives a null speed-equivalent f-number when no line light passes', () => {
    const r = runConeModel({ ...base, lines: ['OIII'] });
    expect(r.lines[0].throughput).toBe(0);
    expect(r.lines[0].speedEquivalentFNumber).toBeNull();
    expect(r.warnings.some((w) => /beyond the measured range/.test(w))).toBe(true);
  });

  it('applies the radial velocity to the line and its neighbours', () => {
    const r = runConeModel({ ...base, lines: ['Ha'], radialVelocityKms: 150 });
    expect(r.lines[0].wavelengthNm).toBeCloseTo(dopplerShift(656.28, 150), 10);
    expect(r.neighbours.find((n) => n.id === 'NII-658')!.wavelengthNm).toBeCloseTo(dopplerShift(658.35, 150), 10);
  });

  it('accepts a custom line wavelength and picks catalogued neighbours near it', () => {
    const r = runConeModel({ ...base, lineNm: 656.5 });
    expect(r.lines[0].id).toBe('custom');
    expect(r.lines[0].wavelengthNm).toBe(656.5);
    expect(r.neighbours.map((n) => n.id)).toContain('Ha');
  });

  it('chooses the catalogued line nearest the passband when none is given, and says so', () => {
    const r = runConeModel({ ...base });
    expect(r.lines[0].id).toBe('Ha');
    expect(r.warnings.some((w) => /No line was given/.test(w))).toBe(true);
  });

  it('applies the temperature shift k·(t − t_ref) like a pre-shift (docs/model.md §Pre-shift)', () => {
    const viaTemp = runConeModel({ ...base, lines: ['Ha'], tempCoeffNmPerC: 0.02, tempC: 40, refTempC: 20 });
    const viaShift = runConeModel({ ...base, lines: ['Ha'], preShiftNm: 0.4 });
    expect(viaTemp.lines[0].throughput).toBeCloseTo(viaShift.lines[0].throughput, 12);
  });

  it('brings a curve measured at an AOI back to normal incidence first', () => {
    // the same filter measured at 10° sits blueward; corrected, it must match the 0° result
    const n = 2.05;
    const s = Math.sqrt(1 - Math.sin((10 * Math.PI) / 180) ** 2 / n ** 2);
    const at10 = { wavelengthNm: ha.wavelengthNm.map((x) => x * s), transmission: ha.transmission };
    const a = runConeModel({ ...base, points: at10, measuredAoiDeg: 10, lines: ['Ha'] });
    const b = runConeModel({ ...base, lines: ['Ha'] });
    expect(a.lines[0].throughput).toBeCloseTo(b.lines[0].throughput, 9);
  });

  it('refuses bad input with 422 and details', () => {
    const cases: [string, object][] = [
      ['nEff below 1', { ...base, nEff: 0.9 }],
      ['nEff above 4', { ...base, nEff: 4.5 }],
      ['f-number below 0.5', { ...base, optic: { fNumber: 0.3, obstruction: 0 } }],
      ['obstruction of 1', { ...base, optic: { fNumber: 2, obstruction: 1 } }],
      ['negative obstruction', { ...base, optic: { fNumber: 2, obstruction: -0.2 } }],
      ['unknown line', { ...base, lines: ['Hz'] }],
      ['too few points', { ...base, points: { wavelengthNm: [1, 2, 3], transmission: [0, 1, 0] } }],
    ];
    for (const [why, input] of cases) {
      let err: unknown;
      try {
        runConeModel(input as never);
      } catch (e) {
        err = e;
      }
      expect(err, why).toBeInstanceOf(EngineInputError);
      expect((err as EngineInputError).status, why).toBe(422);
      expect((err as EngineInputError).details.length, why).toBeGreaterThan(0);
    }
    try {
      runConeModel({ ...base, lines: ['Hz'] });
    } catch (e) {
      expect((e as Error).message).toMatch(/Unknown emission line/);
    }
  });
});
