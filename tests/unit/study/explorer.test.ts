import { describe, expect, it } from 'vitest';
import { buildPupil } from '@/lib/engine/pupil';
import { explorerGrid, flatTopThroughput } from '@/lib/study/explorer';

const DEG = Math.PI / 180;

/**
 * Independent reference from docs/model.md §Pupil geometry alone: on axis with the tangent
 * mapping, tan θ = ρ/(2N) and the pupil is uniform in ρ², so the share of light
 * with θ ≤ t is (tan²t − tan²θin)/(tan²θout − tan²θin), with tan θin = ε/(2N) and
 * tan θout = 1/(2N). The flat-top passes the rays whose λ/s(θ) lies in the band.
 */
function analyticFlatTop(N: number, eps: number, n: number, line: number, w: number, d: number): number {
  const uIn = (eps / (2 * N)) ** 2;
  const uOut = (1 / (2 * N)) ** 2;
  const cdf = (theta: number) => {
    const u = Math.tan(theta) ** 2;
    return Math.min(1, Math.max(0, (u - uIn) / (uOut - uIn)));
  };
  const thetaFor = (s: number) => (s >= 1 ? 0 : Math.asin(Math.min(1, n * Math.sqrt(1 - s * s))));
  const lo = line + d - w / 2;
  const hi = line + d + w / 2;
  const sMin = line / hi;
  if (sMin > 1) return 0;
  const upper = cdf(thetaFor(sMin));
  const sMax = line / lo;
  const lower = sMax >= 1 ? 0 : cdf(thetaFor(sMax));
  return upper - lower;
}

describe('flat-top explorer', () => {
  const cases: [number, number, number, number, number][] = [
    // N, ε, n_eff, FWHM, pre-shift
    [2.5, 0.36, 2.0, 2.5, 1],
    [2.5, 0.36, 2.0, 7, 2.5],
    [1.8, 0.42, 1.8, 4.5, 3],
    [3.6, 0, 2.05, 2.5, 0],
    [1.0, 0.2, 2.0, 9, 8],
    [4.8, 0, 2.0, 2, -0.5],
  ];
  for (const [N, eps, n, w, d] of cases) {
    it(`matches the analytic on-axis cone at f/${N}, ε ${eps}, n ${n}, ${w} nm, Δ ${d} nm`, () => {
      const pupil = buildPupil({ fNumber: N, obstruction: eps });
      const got = flatTopThroughput(pupil, n, 656.28, w, d);
      expect(got).toBeCloseTo(analyticFlatTop(N, eps, n, 656.28, w, d), 3);
    });
  }

  it('passes everything in a near-collimated beam when the line is inside the band, nothing when outside', () => {
    const pupil = buildPupil({ fNumber: 40, obstruction: 0 });
    expect(flatTopThroughput(pupil, 2, 656.28, 3, 0)).toBeCloseTo(1, 6);
    expect(flatTopThroughput(pupil, 2, 656.28, 3, 2)).toBe(0);
    expect(flatTopThroughput(pupil, 2, 656.28, 3, -2)).toBe(0);
  });

  it('puts the best pre-shift of a wide band near the mean cone shift on a fast optic', () => {
    // On axis at f/2 the marginal ray meets the filter at 14.0° (docs/model.md §Pupil, common practice).
    const pupil = buildPupil({ fNumber: 2, obstruction: 0 });
    expect(pupil.thetaMaxRad / DEG).toBeCloseTo(14.04, 1);
    const grid = explorerGrid(pupil, 2, 656.28);
    const narrow = grid.ridge.find((r) => r.widthNm === 2)!;
    const wide = grid.ridge.find((r) => r.widthNm === 15)!;
    // A wide band passes (nearly) the whole cone; a narrow one cannot.
    expect(wide.throughput).toBeGreaterThan(0.99);
    expect(narrow.throughput).toBeLessThan(wide.throughput);
    // The marginal-ray shift λ(1/s − 1) bounds any useful pre-shift.
    const sMarg = Math.sqrt(1 - Math.sin(pupil.thetaMaxRad) ** 2 / 4);
    expect(narrow.shiftNm).toBeGreaterThan(0);
    expect(narrow.shiftNm).toBeLessThan(656.28 * (1 / sMarg - 1));
    // The map is large enough to hold the marginal-ray shift.
    expect(grid.shiftsNm[grid.shiftsNm.length - 1]).toBeGreaterThan(656.28 * (1 / sMarg - 1));
  });

  it('grows to hold every placed curve', () => {
    const pupil = buildPupil({ fNumber: 2.5, obstruction: 0.36 });
    const grid = explorerGrid(pupil, 2, 656.28, [{ key: 'c1', label: 'wide', widthNm: 18, shiftNm: 9, throughput: 0.9 }]);
    expect(grid.widthsNm[grid.widthsNm.length - 1]).toBeGreaterThanOrEqual(18);
    expect(grid.shiftsNm[grid.shiftsNm.length - 1]).toBeGreaterThanOrEqual(9);
    expect(grid.tau.length).toBe(grid.shiftsNm.length);
    expect(grid.tau[0].length).toBe(grid.widthsNm.length);
  });
});
