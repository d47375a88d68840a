import { describe, expect, it } from 'vitest';
import { parseDesign, quarterWaveStackPeakR, stackResponse, unpolarisedT, type Stack } from '@/lib/engine/thin-film';

const L0 = 550;

describe('characteristic matrix against closed forms', () => {
  it('bare interface: Fresnel reflectance at normal incidence and Brewster angle for p (Born & Wolf §1.5.3)', () => {
    const bare: Stack = { incidentIndex: 1, substrateIndex: 1.52, layers: [] };
    // R = ((n1 − n2)/(n1 + n2))² = 0.04258 for crown glass in air
    expect(stackResponse(bare, L0, 0, 's').R).toBeCloseTo(((1 - 1.52) / 2.52) ** 2, 12);
    // tan θB = n2/n1: p light is not reflected at all
    const brewster = (Math.atan(1.52) * 180) / Math.PI;
    expect(stackResponse(bare, L0, brewster, 'p').R).toBeLessThan(1e-15);
    // Fresnel s coefficient at 45°: rs = (n1 cos θi − n2 cos θt)/(n1 cos θi + n2 cos θt)
    const ci = Math.cos(Math.PI / 4);
    const ct = Math.sqrt(1 - (Math.sin(Math.PI / 4) / 1.52) ** 2);
    expect(stackResponse(bare, L0, 45, 's').R).toBeCloseTo(((ci - 1.52 * ct) / (ci + 1.52 * ct)) ** 2, 12);
  });

  it('single quarter-wave layer: R = ((n0 ns − n1²)/(n0 ns + n1²))² at λ0 (Macleod ch. 2); MgF2 on crown glass ≈ 1.26 %', () => {
    for (const [n1, ns] of [[1.38, 1.52], [2.35, 1.52], [1.46, 1.9]]) {
      const s = parseDesign('L', L0, { H: 9, L: n1, substrate: ns });
      const closed = ((ns - n1 * n1) / (ns + n1 * n1)) ** 2;
      expect(stackResponse(s, L0, 0, 's').R).toBeCloseTo(closed, 12);
    }
    // common practice: a single MgF2 layer leaves about 1.3 % on crown glass
    expect(stackResponse(parseDesign('L', L0, { H: 9, L: 1.38 }), L0, 0, 's').R).toBeCloseTo(0.0126, 4);
    // a half-wave layer is absent at λ0: the bare substrate's R
    expect(stackResponse(parseDesign('2H', L0, { H: 2.35, L: 1.46 }), L0, 0, 's').R).toBeCloseTo(((1 - 1.52) / 2.52) ** 2, 12);
  });

  it("quarter-wave stack (HL)^p H: peak R = ((n0 − Y)/(n0 + Y))², Y = (nH/nL)^2p·nH²/ns (Macleod ch. 2)", () => {
    for (const p of [2, 5, 8]) {
      const s = parseDesign(`(HL)^${p} H`, L0, { H: 2.35, L: 1.46 });
      expect(s.layers.length).toBe(2 * p + 1);
      expect(stackResponse(s, L0, 0, 'p').R).toBeCloseTo(quarterWaveStackPeakR(2.35, 1.46, p, 1, 1.52), 12);
    }
  });

  it('energy conservation R + T = 1 for lossless stacks, any angle, both polarisations', () => {
    const s = parseDesign('(HL)^4 2H (LH)^4 L (HL)^4 2H (LH)^4', 656.3, { H: 2.35, L: 1.46 });
    for (const lam of [600, 650.1, 656.3, 657.9, 700]) {
      for (const th of [0, 7.5, 15, 30, 60]) {
        for (const pol of ['s', 'p'] as const) {
          const { R, T } = stackResponse(s, lam, th, pol);
          expect(R + T).toBeCloseTo(1, 10);
          expect(T).toBeGreaterThanOrEqual(0);
        }
      }
    }
  });

  it('s and p agree at normal incidence and part off-normal', () => {
    const s = parseDesign('(HL)^3 2L (LH)^3', 656.3, { H: 2.35, L: 1.46 });
    for (const lam of [640, 652, 656.3, 660]) expect(stackResponse(s, lam, 0, 's').T).toBeCloseTo(stackResponse(s, lam, 0, 'p').T, 14);
    expect(Math.abs(stackResponse(s, 652, 20, 's').T - stackResponse(s, 652, 20, 'p').T)).toBeGreaterThan(1e-3);
  });

  it('a Fabry-Perot passband peaks at 100 % at λ0 between matched mirrors and moves to the blue with angle', () => {
    // symmetric single cavity in a matched medium: T = 1 at resonance (Macleod ch. 7, common knowledge)
    const s = parseDesign('(HL)^4 2H (LH)^4', 656.3, { H: 2.35, L: 1.46, incident: 1.52, substrate: 1.52 });
    expect(unpolarisedT(s, 656.3, 0)).toBeCloseTo(1, 10);
    const peakAt = (theta: number) => {
      let best = 0;
      let at = 0;
      for (let l = 640; l <= 660; l += 0.005) {
        const t = unpolarisedT(s, l, theta);
        if (t > best) [best, at] = [t, l];
      }
      return at;
    };
    expect(peakAt(10)).toBeLessThan(peakAt(0) - 1);
  });

  it('design formula: groups, counts, merging and clear errors', () => {
    const s = parseDesign('(HL)^2 2H (LH)^2', 600, { H: 2, L: 1.5 });
    // H L H L 2H L H L H → HLHL(3H)LHLH: the 2H merges with neither neighbour (they are L)
    expect(s.layers.map((l) => l.n)).toEqual([2, 1.5, 2, 1.5, 2, 1.5, 2, 1.5, 2]);
    expect(s.layers[4].thicknessNm).toBeCloseTo((2 * 600) / (4 * 2), 12);
    expect(parseDesign('H 2H', 600, { H: 2, L: 1.5 }).layers).toHaveLength(1);
    expect(() => parseDesign('(HL', 600, { H: 2, L: 1.5 })).toThrow(/not closed/);
    expect(() => parseDesign('HX', 600, { H: 2, L: 1.5 })).toThrow(/character 2/);
    expect(() => parseDesign('(HL)^999', 600, { H: 2, L: 1.5 })).toThrow(/between 1 and 200/);
    expect(() => parseDesign('(((HL)^200)^200)^200', 600, { H: 2, L: 1.5 })).toThrow(/more than 2000 layers/);
    expect(() => parseDesign('('.repeat(5000) + 'H' + ')'.repeat(5000), 600, { H: 2, L: 1.5 })).toThrow(/deeper than 20/);
  });
});
