import { afterAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn } from '../support/http';
import { closeSequelize } from '@/db/connection';
import { runConeModel } from '@/lib/engine/cone-study';

afterAll(() => closeSequelize());

const post = (path: string, body: unknown, client = anonymous()) =>
  client.fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: typeof body === 'string' ? body : JSON.stringify(body) });

// A 3-cavity-like passband 5 nm wide, 0.5 nm red of Hα, every 0.05 nm.
function passband(cwl = 656.8, fwhm = 5) {
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let i = 0; i <= 1200; i++) {
    const w = cwl - 30 + i * 0.05;
    wavelengthNm.push(Number(w.toFixed(3)));
    transmission.push(0.92 / (1 + ((2 * (w - cwl)) / fwhm) ** 6));
  }
  return { wavelengthNm, transmission };
}

const optic = { fNumber: 2.5, obstruction: 0.36 };

describe('POST /api/model/field-map', () => {
  it('answers the documented shape; the centre is the on-axis cone result (closed form) and the map is symmetric', async () => {
    const points = passband();
    const res = await post('/api/model/field-map', { points, optic, sensor: { widthMm: 23.5, heightMm: 15.6 }, exitPupilMm: 45, nEff: 2.05, lineNm: 656.28, grid: { nx: 20, ny: 14 }, thresholds: [0.5, 0.8] });
    expect(res.status).toBe(200);
    const body = await json(res);
    for (const k of ['centre', 'corner', 'edgeX', 'edgeY']) expect(typeof body[k]).toBe('number');
    const onAxis = runConeModel({ points, optic, nEff: 2.05, lineNm: 656.28 }).lines[0].throughput;
    expect(body.centre).toBeCloseTo(onAxis, 10);
    expect(body.grid.xMm).toHaveLength(20);
    expect(body.grid.yMm).toHaveLength(14);
    expect(body.grid.throughput).toHaveLength(14);
    expect(body.grid.throughput[0]).toHaveLength(20);
    expect(body.grid.throughput[3][2]).toBeCloseTo(body.grid.throughput[10][17], 5);
    expect(body.areaAtLeast.map((a: { threshold: number }) => a.threshold)).toEqual([0.5, 0.8]);
    expect(body.corner).toBeLessThan(body.centre);
  });

  it('takes the exit-pupil distance and sensor diagonal from a saved optic', async () => {
    const owner = await signIn('contributor@bandcone.test');
    const made = await post('/api/optics', { name: 'Field-map lens', fNumber: 2.5, obstruction: 0.36, sensorDiagonalMm: 28.2, exitPupilDistanceMm: 50 }, owner);
    expect(made.status).toBe(201);
    const saved = await json(made);
    const res = await post('/api/model/field-map', { points: passband(), opticId: saved.id, nEff: 2.05, lineNm: 656.28 }, owner);
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.warnings.join(' ')).toMatch(/50 mm comes from the saved optic/);
    // 3 : 2 sensor of diagonal 28.2 mm: corner 14.1 mm from the centre, chief ray atan(14.1/50)
    const last = body.profile.radiusMm.length - 1;
    expect(body.profile.radiusMm[last]).toBeCloseTo(14.1, 6);
    expect(body.profile.chiefRayDeg[last]).toBeCloseTo((Math.atan(14.1 / 50) * 180) / Math.PI, 6);
    // a visitor cannot use someone's private optic
    expect((await post('/api/model/field-map', { points: passband(), opticId: saved.id, nEff: 2.05, lineNm: 656.28 })).status).toBe(404);
  });

  it('refuses bad input with 422 naming the field', async () => {
    const base = { points: passband(), optic, sensor: { widthMm: 23.5, heightMm: 15.6 }, exitPupilMm: 45, nEff: 2.05, lineNm: 656.28 };
    const cases: [object, string][] = [
      [{ ...base, sensor: { widthMm: 0, heightMm: 15 } }, 'sensor.widthMm'],
      [{ ...base, grid: { nx: 1000, ny: 10 } }, 'grid.nx'],
      [{ ...base, cornerAngleDeg: 10 }, 'exitPupilMm'],
      [{ ...base, exitPupilMm: undefined }, 'exitPupilMm'],
      [{ ...base, exitPupilMm: undefined, chiefRayTable: [{ imageHeightMm: 5, chiefRayDeg: 70 }] }, 'chiefRayTable.0.chiefRayDeg'],
      [{ ...base, exitPupilMm: 4 }, 'chiefRay'],
      [{ ...base, lineNm: undefined }, 'lineNm'],
      [{ ...base, sensor: undefined }, 'sensor'],
    ];
    for (const [body, field] of cases) {
      const res = await post('/api/model/field-map', body);
      expect(res.status, JSON.stringify(body).slice(-120)).toBe(422);
      const err = await json(res);
      expect(err.details.map((d: { field?: string }) => d.field)).toContain(field);
    }
  });
});
