import { describe, expect, it } from 'vitest';
import { buildDemoWorld } from '@/seeds/world';
import { sparklineOf, SPARKLINE_POINTS } from '@/lib/catalogue/sparkline';
import { computeMetrics } from '@/lib/engine/metrics';

describe('result-row sparklines', () => {
  const curves = buildDemoWorld().curves;

  it('carry at most 60 points, keep the passband in view and nearly all of its peak', () => {
    for (const c of curves) {
      const m = computeMetrics(c.points);
      const s = sparklineOf(c.points, m.fwhmNm);
      expect(s.wavelengthNm.length).toBeLessThanOrEqual(SPARKLINE_POINTS);
      expect(s.wavelengthNm.length).toBe(s.transmission.length);
      if (m.leftNm !== null && m.rightNm !== null) {
        expect(s.wavelengthNm[0]).toBeLessThan(m.leftNm);
        expect(s.wavelengthNm[s.wavelengthNm.length - 1]).toBeGreaterThan(m.rightNm);
      }
      expect(Math.max(...s.transmission)).toBeGreaterThan(0.9 * m.peakT);
      for (let i = 1; i < s.wavelengthNm.length; i++) expect(s.wavelengthNm[i]).toBeGreaterThan(s.wavelengthNm[i - 1]);
    }
  });
});
