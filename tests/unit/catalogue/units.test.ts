import { describe, expect, it } from 'vitest';
import { normalCwlNm, unitLeads } from '@/lib/catalogue/units';

describe('one catalogue row per unit', () => {
  it('leads each set by its lowest angle, then lowest id; a curve without a set leads itself', () => {
    // ids 10, 11, 12 one set (key 0) at 16°, 0°, 8°; id 13 alone; ids 14, 15 another set both at 5°
    const ids = [10, 11, 12, 13, 14, 15];
    const aoi = [16, 0, 8, 0, 5, 5];
    const key = [0, 0, 0, -1, 1, 1];
    expect([...unitLeads(ids, aoi, key)]).toEqual([0, 1, 0, 1, 1, 0]);
    // the order rows arrive in does not matter
    expect([...unitLeads([12, 11, 10], [8, 0, 16], [0, 0, 0])]).toEqual([0, 1, 0]);
  });

  it('brings a CWL measured off normal to normal incidence with λ0 = λθ / sqrt(1 − sin²θ/n²)', () => {
    // worked by hand: 649.5 nm at 16° with n = 2.0: sin 16° = 0.275637, s = sqrt(1 − 0.0759938/4) = 0.990455,
    // λ0 = 649.5 / 0.990455 = 655.76 nm (docs/model.md §Angle shift; the formula is the standard thin-film
    // effective-index approximation, e.g. H. A. Macleod, Thin-Film Optical Filters, ch. 8, from memory)
    expect(normalCwlNm(649.5, 16, null)).toBeCloseTo(655.759, 2);
    // the set's fitted n_eff when it is a plausible one; 2.0 otherwise
    const s = Math.sin((16 * Math.PI) / 180);
    expect(normalCwlNm(649.5, 16, 1.6)).toBeCloseTo(649.5 / Math.sqrt(1 - (s * s) / (1.6 * 1.6)), 10);
    expect(normalCwlNm(649.5, 16, 7)).toBe(normalCwlNm(649.5, 16, null));
    expect(normalCwlNm(656.3, 0, 1.6)).toBe(656.3);
    expect(normalCwlNm(null, 16, 2)).toBeNull();
  });
});
