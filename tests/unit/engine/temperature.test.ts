import { describe, expect, it } from 'vitest';
import { COATING_TEMP_COEFF, defaultTempCoeff, fitTempCoeff, temperatureSet } from '@/lib/engine/temperature';

describe('temperature coefficient', () => {
  it('defaults by coating, stated with their sources; none when the coating is unknown', () => {
    // issue text and common practice: hard coatings 0.002–0.005 nm/°C; evaporated 0.01–0.02 nm/°C (W. J. Smith)
    expect(COATING_TEMP_COEFF.hard.range).toEqual([0.002, 0.005]);
    expect(COATING_TEMP_COEFF.soft.range).toEqual([0.01, 0.02]);
    for (const c of ['hard', 'soft'] as const) {
      const d = defaultTempCoeff(c)!;
      expect(d.nmPerC).toBeGreaterThanOrEqual(d.range[0]);
      expect(d.nmPerC).toBeLessThanOrEqual(d.range[1]);
      expect(d.source.length).toBeGreaterThan(10);
    }
    expect(defaultTempCoeff('unknown')).toBeNull();
    expect(defaultTempCoeff(undefined)).toBeNull();
  });

  it('least-squares slope on the textbook example x = 1..5, y = 2,4,5,4,5 → slope 0.6, intercept 2.2 (from memory)', () => {
    const fit = fitTempCoeff([1, 2, 3, 4, 5].map((t, i) => ({ tempC: t, cwlNm: [2, 4, 5, 4, 5][i] })));
    expect(fit.nmPerC).toBeCloseTo(0.6, 12);
    expect(fit.cwlAt20Nm).toBeCloseTo(2.2 + 0.6 * 20, 12);
  });

  it('recovers an exact drift and refuses a single temperature', () => {
    const fit = fitTempCoeff([-10, 0, 20, 35].map((t) => ({ tempC: t, cwlNm: 656.3 + 0.0035 * (t - 20) })));
    expect(fit.nmPerC).toBeCloseTo(0.0035, 12);
    expect(fit.rmsResidualNm).toBeLessThan(1e-9);
    expect(() => fitTempCoeff([{ tempC: 20, cwlNm: 656 }, { tempC: 20, cwlNm: 656.1 }])).toThrow(/two or more different temperatures/);
  });

  it('a submission at one AOI and several temperatures gives a fit, checked against the declared coating', () => {
    const files = [-10, 5, 20].map((t) => ({ aoiDeg: 0, tempC: t, cwlNm: 656.3 + 0.015 * (t - 20) }));
    const soft = temperatureSet(files, 'soft');
    expect(soft.fit!.nmPerC).toBeCloseTo(0.015, 10);
    expect(soft.checks[0]).toMatchObject({ code: 'set-temp', level: 'info' });
    // 0.015 nm/°C is three times the hard-coating ceiling: the moderator is warned
    expect(temperatureSet(files, 'hard').checks[0].level).toBe('warn');
    // a multi-angle set at one temperature has no temperature fit
    expect(temperatureSet([0, 10, 20].map((a) => ({ aoiDeg: a, tempC: 20, cwlNm: 656 - a * 0.1 })), 'hard').fit).toBeNull();
  });

  it('never reads the s/p split of a polarised set as a temperature drift', () => {
    // s and p at 10° sit 0.07 nm apart (docs/model.md §Polarised sets), measured half a degree apart
    const sp = [
      { aoiDeg: 0, tempC: 21, cwlNm: 656.3, polarization: 'unpolarized' },
      { aoiDeg: 10, tempC: 21.5, cwlNm: 653.6, polarization: 's' },
      { aoiDeg: 10, tempC: 22, cwlNm: 653.53, polarization: 'p' },
    ];
    expect(temperatureSet(sp, 'hard').fit).toBeNull();
    // the same light at two temperatures still fits
    const warm = temperatureSet([...sp, { aoiDeg: 10, tempC: 31.5, cwlNm: 653.635, polarization: 's' }], 'hard');
    expect(warm.fit!.nmPerC).toBeCloseTo(0.0035, 9);
  });
});
