import { describe, expect, it } from 'vitest';
import { lineThroughput } from '@/lib/engine/cone';
import { runConeModel } from '@/lib/engine/cone-study';
import { chiefRayLaw, fieldMap, quadrantArc } from '@/lib/engine/field-map';
import { buildPupil } from '@/lib/engine/pupil';
import { EngineInputError } from '@/lib/engine/errors';
import { bruteForceTaus, flatTop, multiCavity } from './fixtures';

const optic = { fNumber: 2.5, obstruction: 0.36 };
const sensor = { widthMm: 23.5, heightMm: 15.6 };
const curve = multiCavity(657.4, 4, 3, { ripple: 0.01 });

describe('field map: whole sensor from a radial profile', () => {
  it('centre equals the existing on-axis cone result (closed form: the chief ray is on the axis there)', () => {
    const m = fieldMap({ points: curve, optic, sensor, chiefRay: { exitPupilMm: 60 }, nEff: 2.05, lineNm: 656.28 });
    const cone = runConeModel({ points: curve, optic, nEff: 2.05, lineNm: 656.28 });
    expect(m.centre).toBeCloseTo(cone.lines[0].throughput, 12);
  });

  it('the map is symmetric left-right and top-bottom (rotational symmetry of the model)', () => {
    const m = fieldMap({ points: curve, optic, sensor, chiefRay: { exitPupilMm: 45 }, nEff: 2.05, lineNm: 656.28, grid: { nx: 31, ny: 20 } });
    const t = m.grid.throughput;
    for (let j = 0; j < 20; j++) for (let i = 0; i < 31; i++) {
      expect(t[j][i]).toBeCloseTo(t[19 - j][i], 12);
      expect(t[j][i]).toBeCloseTo(t[j][30 - i], 12);
    }
    expect(m.grid.xMm[0]).toBeCloseTo(-sensor.widthMm / 2 + sensor.widthMm / 62, 12);
  });

  it('agrees with independent brute-force pupil integration at field points (midpoint rule over the pupil from ray vectors, tests/unit/engine/fixtures.ts)', () => {
    // Field points: a grid cell's centre, the edge midpoint and the corner; chief ray atan(r/d).
    const d = 40;
    const m = fieldMap({ points: curve, optic, sensor, chiefRay: { exitPupilMm: d }, nEff: 2.05, lineNm: 656.28, grid: { nx: 47, ny: 31 } });
    const cases = [
      { r: Math.hypot(m.grid.xMm[5], m.grid.yMm[7]), tau: m.grid.throughput[7][5] },
      { r: Math.hypot(m.grid.xMm[30], m.grid.yMm[20]), tau: m.grid.throughput[20][30] },
      { r: sensor.widthMm / 2, tau: m.edgeX },
      { r: Math.hypot(sensor.widthMm, sensor.heightMm) / 2, tau: m.corner },
    ];
    for (const { r, tau } of cases) {
      const fieldAngleDeg = (Math.atan(r / d) * 180) / Math.PI;
      const [ref] = bruteForceTaus(curve, { ...optic, fieldAngleDeg }, [656.28], 2.05, { nRho: 1500, nPsi: 1500 });
      expect(Math.abs(tau - ref)).toBeLessThan(5e-4);
    }
  }, 120_000);

  it('interpolated pixels stay within 5e-4 of the exact model at every pixel of a coarse map', () => {
    const steep = flatTop(657.2, 3, 0.1, 0.95, 0.02, 15);
    const d = 30;
    const m = fieldMap({ points: steep, optic, sensor, chiefRay: { exitPupilMm: d }, nEff: 1.9, lineNm: 656.28, grid: { nx: 24, ny: 16 } });
    let worst = 0;
    for (let j = 0; j < 16; j += 3) for (let i = 0; i < 24; i += 2) {
      const r = Math.hypot(m.grid.xMm[i], m.grid.yMm[j]);
      const exact = lineThroughput(steep, buildPupil({ ...optic, fieldAngleDeg: (Math.atan(r / d) * 180) / Math.PI }), 656.28, { nEff: 1.9 }).throughput;
      worst = Math.max(worst, Math.abs(exact - m.grid.throughput[j][i]));
    }
    expect(worst).toBeLessThan(5e-4);
  });

  it('a corner angle is the same law as the exit-pupil distance d = r_corner / tan θ (closed form)', () => {
    const rK = Math.hypot(sensor.widthMm, sensor.heightMm) / 2;
    const d = 50;
    const cornerAngleDeg = (Math.atan(rK / d) * 180) / Math.PI;
    const a = fieldMap({ points: curve, optic, sensor, chiefRay: { exitPupilMm: d }, nEff: 2.05, lineNm: 656.28 });
    const b = fieldMap({ points: curve, optic, sensor, chiefRay: { cornerAngleDeg }, nEff: 2.05, lineNm: 656.28 });
    expect(b.corner).toBeCloseTo(a.corner, 10);
    expect(b.edgeY).toBeCloseTo(a.edgeY, 10);
  });

  it('a chief-ray table interpolates linearly and carries its f-numbers', () => {
    const law = chiefRayLaw({ table: [{ imageHeightMm: 10, chiefRayDeg: 8, fNumber: 2.8 }, { imageHeightMm: 20, chiefRayDeg: 12 }] }, sensor, 2.5);
    expect(law.at(0)).toEqual({ deg: 0, fNumber: 2.5 });
    expect(law.at(5).deg).toBeCloseTo(4, 12);
    expect(law.at(5).fNumber).toBeCloseTo(2.65, 12);
    expect(law.at(15).deg).toBeCloseTo(10, 12);
    expect(law.at(30).deg).toBe(12);
    const m = fieldMap({ points: curve, optic, sensor, chiefRay: { table: [{ imageHeightMm: 6, chiefRayDeg: 9, fNumber: 2.8 }] }, nEff: 2.05, lineNm: 656.28 });
    expect(m.warnings.join(' ')).toMatch(/stops at 6 mm/);
    const direct = lineThroughput(curve, buildPupil({ fNumber: 2.8, obstruction: 0.36, fieldAngleDeg: 9 }), 656.28, { nEff: 2.05 }).throughput;
    expect(m.corner).toBeCloseTo(direct, 12);
  });

  it('area share: a flat curve keeps everything; the rectangle–disc area is the closed form πr²/4ab inside the inscribed circle', () => {
    const flat = { wavelengthNm: [600, 650, 700, 750, 800], transmission: [0.8, 0.8, 0.8, 0.8, 0.8] };
    const m = fieldMap({ points: flat, optic, sensor, chiefRay: { exitPupilMm: 30 }, nEff: 2, lineNm: 700, thresholds: [0.79, 0.81] });
    expect(m.areaAtLeast[0].share).toBeCloseTo(1, 3);
    expect(m.areaAtLeast[1].share).toBe(0);
    // ∫₀^r quadrantArc = πr²/4 for r ≤ min(a, b)
    let s = 0;
    const r = 5;
    for (let k = 0; k < 10000; k++) s += quadrantArc((k + 0.5) * (r / 10000), 11.75, 7.8) * (r / 10000);
    expect(s).toBeCloseTo((Math.PI * r * r) / 4, 5);
    // and the whole quadrant for r up to the corner: ab
    s = 0;
    const rK = Math.hypot(11.75, 7.8);
    for (let k = 0; k < 20000; k++) s += quadrantArc((k + 0.5) * (rK / 20000), 11.75, 7.8) * (rK / 20000);
    expect(s).toBeCloseTo(11.75 * 7.8, 2);
  });

  it('area share agrees with counting a fine grid of pixels', () => {
    const base = { points: curve, optic: { fNumber: 1.8, obstruction: 0.2 }, sensor, chiefRay: { exitPupilMm: 25 }, nEff: 1.8, lineNm: 656.28 };
    const probe = fieldMap(base);
    const th = 0.5 * (probe.centre + probe.corner);
    const m = fieldMap({ ...base, grid: { nx: 400, ny: 266 }, thresholds: [th] });
    const flat = m.grid.throughput.flat();
    const counted = flat.filter((t) => t >= th).length / flat.length;
    expect(counted).toBeGreaterThan(0.05);
    expect(counted).toBeLessThan(0.95);
    expect(Math.abs(m.areaAtLeast[0].share - counted)).toBeLessThan(0.01);
  });

  it('refuses bad input naming the field', () => {
    const bad = (over: object, field: string) => {
      try {
        fieldMap({ points: curve, optic, sensor, chiefRay: { exitPupilMm: 40 }, nEff: 2, lineNm: 656.28, ...over });
        throw new Error('accepted');
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError);
        expect((e as EngineInputError).details.map((d) => d.field)).toContain(field);
      }
    };
    bad({ sensor: { widthMm: -1, heightMm: 10 } }, 'sensor.widthMm');
    bad({ grid: { nx: 1000, ny: 10 } }, 'grid.nx');
    bad({ chiefRay: { cornerAngleDeg: 60 } }, 'cornerAngleDeg');
    bad({ chiefRay: { table: [{ imageHeightMm: 3, chiefRayDeg: 5 }, { imageHeightMm: 3, chiefRayDeg: 6 }] } }, 'chiefRayTable.1.imageHeightMm');
    bad({ chiefRay: { exitPupilMm: 5 } }, 'chiefRay'); // corner at atan(14.1/5) ≈ 70°
    bad({ thresholds: [1.5] }, 'thresholds.0');
  });
});
