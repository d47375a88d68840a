import { describe, expect, it } from 'vitest';
import { angleScale, angleScaleOfSin2, angleScaleSql, DEG } from '@/lib/engine/angles';

// s(θ) = sqrt(1 − sin²θ / n²) (docs/model.md §Angle shift), checked at angles whose sine is
// known in closed form: sin 30° = 1/2, sin 90° = 1, sin 0 = 0.
describe('the angle scale, written once', () => {
  it('matches the closed form at 0°, 30° and 90°', () => {
    expect(angleScale(0, 2)).toBe(1);
    expect(angleScale(30, 2)).toBeCloseTo(Math.sqrt(1 - 0.25 / 4), 14);
    expect(angleScale(90, 1.5)).toBeCloseTo(Math.sqrt(1 - 1 / 2.25), 14);
    expect(angleScale(30, 1)).toBeCloseTo(Math.cos(30 * DEG), 14); // n = 1: s = cos θ
  });

  it('the sin² form and the SQL form are the same formula', () => {
    const n = 2.05;
    const s = Math.sin(17 * DEG);
    expect(angleScaleOfSin2(s * s, 1 / (n * n))).toBeCloseTo(angleScale(17, n), 15);
    expect(angleScaleSql('c.aoi_deg', n)).toBe(`sqrt(1 - sin(radians(c.aoi_deg))^2 * ${(1 / (n * n)).toPrecision(15)})`);
  });

  it('DEG is π/180 (a right angle is π/2)', () => {
    expect(90 * DEG).toBe(Math.PI / 2);
  });
});
