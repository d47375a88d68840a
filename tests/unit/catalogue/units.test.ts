import { describe, expect, it } from 'vitest';
import { oneCurvePerUnit } from '@/lib/catalogue/units';
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
