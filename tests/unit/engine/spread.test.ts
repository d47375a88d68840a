import { describe, expect, it } from 'vitest';
import { unitSpread } from '@/lib/engine/spread';

describe('unit-to-unit spread', () => {
  it('uses the sample standard deviation (n − 1), as in any statistics handbook', () => {
    // 2, 4, 4, 4, 5, 5, 7, 9: mean 5, sample sd sqrt(32/7)
    const cwl = [2, 4, 4, 4, 5, 5, 7, 9];
    const s = unitSpread(cwl.map((c, i) => ({ cwlNm: 650 + c, fwhmNm: 3 + i * 0.1 })));
    expect(s.count).toBe(8);
    expect(s.cwl.mean).toBeCloseTo(655, 12);
    expect(s.cwl.sd!).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(s.cwl.min).toBe(652);
    expect(s.cwl.max).toBe(659);
    expect(s.fwhm.min).toBe(3);
    expect(s.fwhm.max).toBeCloseTo(3.7, 12);
  });

  it('gives a null sd for a single unit and nulls for none', () => {
    const one = unitSpread([{ cwlNm: 656.1, fwhmNm: 3 }]);
    expect(one.cwl.sd).toBeNull();
    expect(one.cwl.mean).toBe(656.1);
    const none = unitSpread([]);
    expect(none).toEqual({ count: 0, cwl: { mean: null, sd: null, min: null, max: null }, fwhm: { mean: null, sd: null, min: null, max: null } });
  });

  it('skips curves whose CWL or FWHM is undefined', () => {
    const s = unitSpread([{ cwlNm: 656, fwhmNm: null }, { cwlNm: null, fwhmNm: 3 }, { cwlNm: 657, fwhmNm: 4 }]);
    expect(s.count).toBe(3);
    expect(s.cwl.mean).toBe(656.5);
    expect(s.fwhm.mean).toBe(3.5);
  });
});
