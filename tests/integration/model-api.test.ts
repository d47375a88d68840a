import { afterAll, describe, expect, it } from 'vitest';
import { anonymous, json } from '../support/http';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

const post = (path: string, body: unknown) =>
  anonymous().fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: typeof body === 'string' ? body : JSON.stringify(body) });

// A flat-topped passband 10 nm wide around Hα, sampled every 0.1 nm.
function flatTop(centre = 656.28, width = 10) {
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let w = centre - 30; w <= centre + 30 + 1e-9; w += 0.1) {
    wavelengthNm.push(Number(w.toFixed(2)));
    transmission.push(Math.abs(w - centre) <= width / 2 ? 0.9 : 0.0001);
  }
  return { wavelengthNm, transmission };
}

describe('POST /api/model/cone', () => {
  it('passes the line at the full peak when the passband is wider than the whole cone shift', async () => {
    // Geometry, common practice: the f/2 marginal ray meets the filter at 14.0°; with n_eff 2.0 that moves
    // 656 nm by 656·(1 − sqrt(1 − sin²14°/4)) ≈ 4.8 nm, inside a flat top 10 nm wide centred on the line
    // when pre-shifted 2.5 nm to the red.
    const res = await post('/api/model/cone', { points: flatTop(656.28 + 2.5, 10), optic: { fNumber: 2, obstruction: 0 }, nEff: 2, lines: ['Ha'] });
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.lines[0].id).toBe('Ha');
    expect(body.lines[0].throughput).toBeCloseTo(0.9, 3);
    expect(body.lines[0].speedEquivalentFNumber).toBeCloseTo(2 * Math.sqrt(0.9 / body.lines[0].throughput), 6);
    expect(body.angleHistogram.reduce((s: number, b: { weight: number }) => s + b.weight, 0)).toBeCloseTo(1, 6);
    expect(body.neighbours.map((n: { id: string }) => n.id)).toEqual(expect.arrayContaining(['NII-658', 'NII-655']));
  });

  it('reads a stored curve by id with its measured AOI, and hides unverified ones from visitors', async () => {
    const [verified] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 1`);
    const ok = await post('/api/model/cone', { curveId: verified.id, optic: { fNumber: 2.8, obstruction: 0.3 }, nEff: 2, includeCurve: true });
    expect(ok.status).toBe(200);
    const body = await json(ok);
    expect(body.coneCurve.wavelengthNm.length).toBe(body.coneCurve.transmission.length);
    const [waiting] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'submitted' ORDER BY id LIMIT 1`);
    expect((await post('/api/model/cone', { curveId: waiting.id, optic: { fNumber: 2, obstruction: 0 }, nEff: 2 })).status).toBe(404);
  });

  it('answers every bad body with a 4xx and a readable error, never a 500', async () => {
    const cases: [unknown, number][] = [
      ['{not json', 400],
      ['', 400],
      [{ optic: { fNumber: 2, obstruction: 0 }, nEff: 2 }, 422],
      [{ points: flatTop(), optic: { fNumber: 0.2, obstruction: 0 }, nEff: 2 }, 422],
      [{ points: flatTop(), optic: { fNumber: 2, obstruction: 1.2 }, nEff: 2 }, 422],
      [{ points: flatTop(), optic: { fNumber: 2, obstruction: 0 }, nEff: 5 }, 422],
      [{ points: flatTop(), optic: { fNumber: 2, obstruction: 0 }, nEff: 2, lines: ['Zz'] }, 422],
      [{ points: { wavelengthNm: [1, 2, 3], transmission: [0, 1, 0] }, optic: { fNumber: 2, obstruction: 0 }, nEff: 2 }, 422],
      [{ points: { wavelengthNm: [650, 651, 652, 651, 653], transmission: [0, 0.5, 0.9, 0.2, 0] }, optic: { fNumber: 2, obstruction: 0 }, nEff: 2 }, 422],
    ];
    for (const [body, status] of cases) {
      const res = await post('/api/model/cone', body);
      expect(res.status, JSON.stringify(body).slice(0, 80)).toBe(status);
      const payload = await json(res);
      expect(typeof payload.error).toBe('string');
      expect(payload.error.length).toBeGreaterThan(5);
    }
  });
});

describe('POST /api/model/neff', () => {
  it('recovers a known effective index from CWLs at several angles (docs/model.md §Effective index)', async () => {
    // Thin-film angle shift (Macleod; Smith): λ(θ) = λ0·sqrt(1 − sin²θ/n²), here λ0 656.3 nm, n 1.9.
    const n = 1.9;
    const measurements = [0, 5, 10, 15].map((aoiDeg) => ({ aoiDeg, cwlNm: 656.3 * Math.sqrt(1 - Math.sin((aoiDeg * Math.PI) / 180) ** 2 / n ** 2) }));
    const res = await post('/api/model/neff', { measurements });
    expect(res.status).toBe(200);
    const fit = await json(res);
    expect(fit.nEff).toBeCloseTo(1.9, 3);
    expect(fit.cwl0Nm).toBeCloseTo(656.3, 3);
    expect(fit.rmsResidualNm).toBeLessThan(1e-3);
  });

  it('fits a stored multi-angle set by curve ids', async () => {
    const rows = await query<{ id: number }>(
      `SELECT id FROM curves WHERE status = 'verified' AND set_key = (SELECT set_key FROM curves WHERE set_key IS NOT NULL AND status = 'verified' ORDER BY id LIMIT 1) ORDER BY aoi_deg`,
    );
    expect(rows.length).toBeGreaterThanOrEqual(2);
    const res = await post('/api/model/neff', { curveIds: rows.map((r) => r.id) });
    expect(res.status).toBe(200);
    const fit = await json(res);
    // The demo sets are generated with n_eff between 1.7 and 2.1.
    expect(fit.nEff).toBeGreaterThan(1.6);
    expect(fit.nEff).toBeLessThan(2.2);
  });

  it('refuses a set that moves redward with a 422 that says so', async () => {
    const res = await post('/api/model/neff', { measurements: [{ aoiDeg: 0, cwlNm: 656 }, { aoiDeg: 10, cwlNm: 657 }] });
    expect(res.status).toBe(422);
    expect((await json(res)).error).toMatch(/blueward/);
  });
});

describe('POST /api/curves/preview', () => {
  it('reads a semicolon file with decimal commas in percent, and says what it assumed', async () => {
    const rows = ['Wavelength [nm];T [%]'];
    for (let w = 640; w <= 672; w += 0.5) rows.push(`${w.toFixed(1).replace('.', ',')};${(90 / (1 + ((w - 656.3) / 1.5) ** 6)).toFixed(3).replace('.', ',')}`);
    const form = new FormData();
    form.append('file', new Blob([rows.join('\r\n')]), 'bench.csv');
    const res = await anonymous().fetch('/api/curves/preview', { method: 'POST', body: form });
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.assumed).toMatchObject({ delimiter: ';', decimalSeparator: ',', transmissionUnit: 'percent', wavelengthUnit: 'nm', headerLines: 1 });
    expect(body.metrics.peakT).toBeCloseTo(0.9, 2);
    expect(body.metrics.fwhmNm).toBeCloseTo(3, 1);
  });

  it('names the line of an unreadable number with a 422', async () => {
    const form = new FormData();
    form.append('file', new Blob(['650,0.1\n651,0.2\n652,abc\n653,0.9\n654,0.2\n655,0.1\n']), 'broken.csv');
    const res = await anonymous().fetch('/api/curves/preview', { method: 'POST', body: form });
    expect(res.status).toBe(422);
    const body = await json(res);
    expect(body.details[0].line).toBe(3);
  });
});
