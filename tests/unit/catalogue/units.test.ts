import { describe, expect, it } from 'vitest';
import { normalCwlNm, oneCurvePerUnit, unitLeads } from '@/lib/catalogue/units';
import { unitSpread } from '@/lib/engine/spread';

describe('one curve per unit in a label’s spread', () => {
  it('a set at 5–35 °C counts once, by its curve nearest 20 °C; single curves and other sets stay', () => {
    const k = 0.0162; // a soft coating's drift, nm/°C (W. J. Smith: 0.01–0.02)
    const temp = [5, 15, 25, 35].map((t, i) => ({ id: 10 + i, setKey: 'u1-tset', method: { temperatureC: t }, cwlNm: 500 + k * (t - 20), fwhmNm: 7 }));
    const others = [
      { id: 1, setKey: null, method: { temperatureC: 21 }, cwlNm: 500.05, fwhmNm: 7 },
      { id: 2, setKey: 'u2-set', method: {}, cwlNm: 499.95, fwhmNm: 7 },
    ];
    const kept = oneCurvePerUnit([...others, ...temp]);
    // 15 and 25 °C are equally near 20 °C: the lower id (15 °C) stands for the unit
    expect(kept.map((c) => c.id)).toEqual([1, 2, 11]);
    // counted per curve, the drift would be read as spread between units (0.49 nm across the set)
    const all = unitSpread([...others, ...temp]);
    const units = unitSpread(kept);
    expect(all.count).toBe(6);
    expect(units.count).toBe(3);
    expect(Math.max(...kept.map((c) => c.cwlNm)) - Math.min(...kept.map((c) => c.cwlNm))).toBeLessThan(0.2);
  });
});

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
