import { describe, expect, it } from 'vitest';
import { normalisedPointsHash, runChecks, type CheckMetadata } from '@/lib/engine/checks';
import { computeMetrics } from '@/lib/engine/metrics';
import { predictCwl } from '@/lib/engine/neff';
import { multiCavity } from './fixtures';

// A 3 nm Hα filter sampled every 0.05 nm over ±30 nm.
const good = computeMetrics(multiCavity(656.3, 3, 3, { peak: 0.9 }));
const meta: CheckMetadata = {
  lines: ['Ha'],
  nominalCwlNm: 656.3,
  nominalFwhmNm: 3,
  method: { instrument: 'spectrophotometer', resolutionNm: 0.1, beam: 'collimated', aoiDeg: 0 },
};
const byCode = (checks: ReturnType<typeof runChecks>, code: string) => checks.filter((c) => c.code === code);

describe('automatic checks', () => {
  it('a clean submission raises no warning or error', () => {
    const checks = runChecks({ metrics: good, metadata: meta });
    expect(checks.filter((c) => c.level !== 'info')).toEqual([]);
    expect(byCode(checks, 'cwl-nominal')[0].level).toBe('info');
    expect(byCode(checks, 'sampling')[0].level).toBe('info');
  });

  it('warns when the measured CWL is more than 0.5 nm from nominal', () => {
    const checks = runChecks({ metrics: good, metadata: { ...meta, nominalCwlNm: 657 } });
    expect(byCode(checks, 'cwl-nominal')[0]).toMatchObject({ level: 'warn' });
    expect(byCode(runChecks({ metrics: good, metadata: { ...meta, nominalCwlNm: 656.7 } }), 'cwl-nominal')[0].level).toBe('info');
  });

  it('allows the blueward angle shift when the curve was measured off normal', () => {
    const m = computeMetrics(multiCavity(predictCwl(656.3, 2, 10), 3, 3));
    expect(byCode(runChecks({ metrics: m, metadata: meta, aoiDeg: 10 }), 'cwl-nominal')[0].level).toBe('info');
    expect(byCode(runChecks({ metrics: m, metadata: meta, aoiDeg: 0 }), 'cwl-nominal')[0].level).toBe('warn');
  });

  it('warns when the FWHM is more than 15 % from nominal', () => {
    expect(byCode(runChecks({ metrics: good, metadata: { ...meta, nominalFwhmNm: 2.5 } }), 'fwhm-nominal')[0].level).toBe('warn');
    expect(byCode(runChecks({ metrics: good, metadata: { ...meta, nominalFwhmNm: 3.3 } }), 'fwhm-nominal')[0].level).toBe('info');
  });

  it('warns when the measured range does not cover CWL ± 3·FWHM', () => {
    const narrow = computeMetrics(multiCavity(656.3, 3, 3, { half: 6 }));
    expect(byCode(runChecks({ metrics: narrow }), 'coverage')[0].level).toBe('warn');
  });

  it('warns when the target line is outside the measured range', () => {
    expect(byCode(runChecks({ metrics: good, metadata: { ...meta, lines: ['Ha', 'OIII'] } }), 'line-coverage')).toHaveLength(1);
  });

  it('warns when the sample step is coarser than the declared resolution (undersampled)', () => {
    const checks = runChecks({ metrics: good, metadata: { ...meta, method: { ...meta.method, resolutionNm: 0.02 } } });
    expect(byCode(checks, 'sampling')[0].level).toBe('warn');
  });

  it('warns when resolution or sampling are coarse against the FWHM', () => {
    const coarse = computeMetrics(multiCavity(656.3, 3, 3, { step: 1 }));
    expect(byCode(runChecks({ metrics: coarse }), 'sampling-fwhm')[0].level).toBe('warn');
    expect(byCode(runChecks({ metrics: good, metadata: { ...meta, method: { ...meta.method, resolutionNm: 1 } } }), 'resolution')[0].level).toBe('warn');
  });

  it('flags a peak above 100 % (warn), above 102 % (error) and below 20 % (warn)', () => {
    const peak = (p: number) => byCode(runChecks({ metrics: computeMetrics(multiCavity(656.3, 3, 3, { peak: p })) }), p < 0.5 ? 'peak-low' : 'peak-high')[0]?.level;
    expect(peak(1.01)).toBe('warn');
    expect(peak(1.05)).toBe('error');
    expect(peak(0.15)).toBe('warn');
    expect(peak(0.9)).toBeUndefined();
  });

  it('refuses a converging beam without its f-number', () => {
    const checks = runChecks({ metrics: good, metadata: { ...meta, method: { ...meta.method, beam: 'converging' } } });
    expect(byCode(checks, 'beam-fnumber')[0].level).toBe('error');
    const ok = runChecks({ metrics: good, metadata: { ...meta, method: { ...meta.method, beam: 'converging', beamFNumber: 10 } } });
    expect(byCode(ok, 'beam-fnumber')[0].level).toBe('info');
  });

  it('an undefined passband is an error', () => {
    const rising = computeMetrics({ wavelengthNm: [650, 651, 652, 653, 654], transmission: [0.1, 0.3, 0.6, 0.8, 0.9] });
    expect(byCode(runChecks({ metrics: rising }), 'passband-undefined')[0].level).toBe('error');
  });

  describe('multi-angle sets', () => {
    const at = (aoi: number, n = 2) => ({ aoiDeg: aoi, metrics: computeMetrics(multiCavity(predictCwl(656.3, n, aoi), 3, 3)) });
    it('reports the fitted effective index when the set moves blueward', () => {
      const checks = runChecks({ metrics: good, set: [at(0), at(8), at(16)] });
      const c = byCode(checks, 'set-neff')[0];
      expect(c.level).toBe('info');
      expect(c.message).toMatch(/Effective index 2\.0/);
    });
    it('errors when the set does not move blueward with angle', () => {
      const red = [at(0), { aoiDeg: 12, metrics: computeMetrics(multiCavity(657.3, 3, 3)) }];
      const c = byCode(runChecks({ metrics: good, set: red }), 'set-direction')[0];
      expect(c.level).toBe('error');
      expect(c.message).toMatch(/blueward/);
    });
    it('a fitted n_eff outside the coating materials\' indices becomes a moderator warning with its reason', () => {
      // material indices from memory: MgF2 1.38 lowest; TiO2 about 2.4 highest in the visible; Si about 3.5 in the near IR
      const physical = (set: { aoiDeg: number; metrics: ReturnType<typeof computeMetrics> }[]) => byCode(runChecks({ metrics: good, set }), 'set-neff-physical')[0];
      expect(physical([at(0, 2.05), at(10, 2.05), at(20, 2.05)]).level).toBe('info');
      expect(physical([at(0, 1.55), at(10, 1.55), at(20, 1.55)]).level).toBe('info');
      const high = physical([at(0, 2.8), at(10, 2.8), at(20, 2.8)]);
      expect(high.level).toBe('warn');
      expect(high.message).toMatch(/above the highest coating index in the visible/);
      const low = physical([at(0, 1.2), at(10, 1.2), at(20, 1.2)]);
      expect(low.level).toBe('warn');
      expect(low.message).toMatch(/below the lowest coating index/);
      // in the near infrared a silicon-based stack may reach about 3.5
      const nir = (n: number) => [0, 10, 20].map((a) => ({ aoiDeg: a, metrics: computeMetrics(multiCavity(predictCwl(1550, n, a), 5, 3)) }));
      expect(physical(nir(3.2)).level).toBe('info');
      expect(physical(nir(3.9)).level).toBe('warn');
    });
    it('warns when the set has only one distinct angle', () => {
      expect(byCode(runChecks({ metrics: good, set: [at(5), at(5)] }), 'set-angles')[0].level).toBe('warn');
    });
    it('a set at one angle and several temperatures is a temperature set, not a fault', () => {
      const c = byCode(runChecks({ metrics: good, set: [{ ...at(0), tempC: 5 }, { ...at(0), tempC: 35 }] }), 'set-angles')[0];
      expect(c.level).toBe('info');
      expect(c.message).toContain('dCWL/dT');
      expect(byCode(runChecks({ metrics: good, set: [{ ...at(0), tempC: 20 }, { ...at(0), tempC: 20 }] }), 'set-angles')[0].level).toBe('warn');
    });
    it('every set check code starts with "set"', () => {
      const codes = runChecks({ metrics: good, set: [at(0), at(10)] }).filter((c) => !runChecks({ metrics: good }).some((d) => d.code === c.code)).map((c) => c.code);
      expect(codes.length).toBeGreaterThan(0);
      for (const code of codes) expect(code.startsWith('set')).toBe(true);
    });
  });
});

describe('canonical points text for duplicate detection', () => {
  it('is the same for the same data in any order or unit rounding', () => {
    const a = normalisedPointsHash({ wavelengthNm: [650, 651, 652, 653, 654], transmission: [0.1, 0.45, 0.9, 0.45, 0.1] });
    const b = normalisedPointsHash({ wavelengthNm: [654, 653, 652, 651, 650], transmission: [0.1, 0.45, 0.9, 0.45, 0.1] });
    const c = normalisedPointsHash({ wavelengthNm: [6500 / 10, 6510 / 10, 6520 / 10, 6530 / 10, 6540 / 10], transmission: [10 / 100, 45 / 100, 90 / 100, 45 / 100, 10 / 100] });
    expect(a).toBe(b);
    expect(a).toBe(c);
    expect(a.startsWith('bandcone-points-v1\n650,0.1\n')).toBe(true);
  });
  it('differs when a value differs', () => {
    const a = normalisedPointsHash({ wavelengthNm: [650, 651, 652, 653, 654], transmission: [0.1, 0.45, 0.9, 0.45, 0.1] });
    const b = normalisedPointsHash({ wavelengthNm: [650, 651, 652, 653, 654], transmission: [0.1, 0.45, 0.91, 0.45, 0.1] });
    expect(a).not.toBe(b);
  });
});
