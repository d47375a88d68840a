import { afterAll, describe, expect, it } from 'vitest';
import { anonymous, json } from '../support/http';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';
import { runConeModel } from '@/lib/engine/cone-study';
import { SPEED_OF_LIGHT_KMS } from '@/lib/engine/lines';

afterAll(() => closeSequelize());

const post = (path: string, body: unknown) => anonymous().fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
const get = (path: string) => anonymous().fetch(path);

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

describe('POST /api/model/cone with sky, z and doublets', () => {
  it('answers the sky block: every sky line, the accepted continuum and a gain over a stored reference curve', async () => {
    const [ref] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND 'Ha' = ANY(lines) AND aoi_deg = 0 ORDER BY id LIMIT 1`);
    const res = await post('/api/model/cone', { points: passband(), optic, nEff: 2.05, lines: ['Ha'], sky: { model: 'suburban', reference: { curveId: ref.id } } });
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.sky.lines).toHaveLength(9);
    expect(body.sky.lines.map((l: { id: string }) => l.id)).toContain('Na-589.0');
    expect(body.sky.continuumNm).toBeGreaterThan(0);
    expect(typeof body.sky.gain).toBe('number');
    // the same body through the engine directly (points of the stored reference read back)
    const [pts] = await query<{ w: number[]; t: number[] }>(`SELECT wavelength_nm AS w, transmission AS t FROM curves WHERE id = :id`, { id: ref.id });
    const direct = runConeModel({ points: passband(), optic, nEff: 2.05, lines: ['Ha'], sky: { model: 'suburban', reference: { points: { wavelengthNm: pts.w, transmission: pts.t } } } });
    expect(body.sky.gain).toBeCloseTo(direct.sky!.gain!, 10);
  });

  it('takes z (λ₀(1 + z)), refuses z with radialVelocityKms, and weighs doublets', async () => {
    const z = 0.000677; // M82, NED (from memory)
    const a = await json(await post('/api/model/cone', { points: passband(), optic, nEff: 2.05, lines: ['Ha'], z }));
    expect(a.lines[0].wavelengthNm).toBeCloseTo(656.28 * (1 + z), 9);
    const b = await json(await post('/api/model/cone', { points: passband(), optic, nEff: 2.05, lines: ['Ha'], radialVelocityKms: z * SPEED_OF_LIGHT_KMS }));
    expect(a.lines[0].throughput).toBeCloseTo(b.lines[0].throughput, 10);
    const both = await post('/api/model/cone', { points: passband(), optic, nEff: 2.05, z, radialVelocityKms: 10 });
    expect(both.status).toBe(422);
    expect((await json(both)).details.map((d: { field: string }) => d.field)).toContain('z');
    const d = await json(await post('/api/model/cone', { points: passband(658.6, 6), optic, nEff: 2.05, lines: ['NII-658'], doublets: true }));
    expect(d.target.lines.map((l: { id: string }) => l.id)).toEqual(['NII-658', 'NII-655']);
    expect(d.target.lines[1].weight).toBeCloseTo(1 / 2.94, 10); // Storey & Zeippen 2000 (from memory)
  });

  it('refuses a bad sky with 422 naming the field', async () => {
    const cases: [unknown, string][] = [
      [{ model: 'downtown' }, 'sky.model'],
      [{ model: { continuum: -1, lines: {} } }, 'sky.model'],
      [{ model: 'dark', reference: { boxFwhmNm: -3 } }, 'sky.reference'],
    ];
    for (const [sky, field] of cases) {
      const res = await post('/api/model/cone', { points: passband(), optic, nEff: 2.05, sky });
      expect(res.status, JSON.stringify(sky)).toBe(422);
      const err = await json(res);
      expect(err.details.some((x: { field?: string }) => (x.field ?? '').startsWith(field)), JSON.stringify(err)).toBe(true);
    }
  });
});

describe('GET /api/labels/odds', () => {
  it('counts the units that keep the line and fits a spread; the count matches the cone model run on each unit', async () => {
    const [lab] = await query<{ label: string; n: string }>(
      // a unit is a curve outside a set, or one set (a set at several temperatures counts once: lib/catalogue/units.ts)
      `SELECT label, count(DISTINCT coalesce(set_key, id::text)) AS n FROM curves WHERE status = 'verified' AND aoi_deg = 0 AND 'Ha' = ANY(lines)
       GROUP BY label HAVING count(DISTINCT coalesce(set_key, id::text)) >= 3 ORDER BY count(DISTINCT coalesce(set_key, id::text)) DESC, label LIMIT 1`,
    );
    expect(lab, 'the demo world needs a label with three Hα units').toBeTruthy();
    const qs = new URLSearchParams({ label: lab.label, fNumber: '2.5', obstruction: '0.36', minThroughput: '0.6', line: 'Ha' });
    const res = await get(`/api/labels/odds?${qs}`);
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.units).toBe(Number(lab.n));
    expect(body.probability).toBeGreaterThanOrEqual(0);
    expect(body.probability).toBeLessThanOrEqual(1);
    expect(body.distribution).toMatch(/normal/);
    expect(body.sentence).toMatch(new RegExp(`^${body.meeting} of ${body.units} measured units; `));
    const units = await query<{ w: number[]; t: number[]; n_eff: number | null; cwl_nm: number }>(
      // one curve per unit: of a set, the one measured nearest 20 °C, then the lowest id
      `SELECT w, t, n_eff, cwl_nm FROM (
         SELECT DISTINCT ON (coalesce(set_key, id::text)) id, wavelength_nm AS w, transmission AS t, n_eff, cwl_nm FROM curves
         WHERE status = 'verified' AND aoi_deg = 0 AND label = :label
         ORDER BY coalesce(set_key, id::text), abs(coalesce((method->>'temperatureC')::float8, 20) - 20), id) u ORDER BY id`,
      { label: lab.label },
    );
    const meeting = units.filter((u) => runConeModel({ points: { wavelengthNm: u.w, transmission: u.t }, optic, nEff: u.n_eff ?? 2, lines: ['Ha'] }).lines[0].throughput >= 0.6).length;
    expect(body.meeting).toBe(meeting);
    // fitted mean: the plain average of the units' stored CWLs
    const mean = units.reduce((s, u) => s + u.cwl_nm, 0) / units.length;
    expect(body.cwlSpreadNm.mean).toBeCloseTo(mean, 2);
  });

  it('with fewer than three units answers 200, probability null and a reason', async () => {
    const res = await get(`/api/labels/odds?${new URLSearchParams({ label: 'No such filter label', fNumber: '2.5', obstruction: '0.36', minThroughput: '0.8', line: 'Ha' })}`);
    expect(res.status).toBe(200);
    const body = await json(res);
    expect(body.probability).toBeNull();
    expect(body.units).toBe(0);
    expect(body.reason).toMatch(/No verified unit/);
  });

  it('refuses bad input with 422 naming the field', async () => {
    const base = { label: 'x', fNumber: '2.5', obstruction: '0.36', minThroughput: '0.8', line: 'Ha' };
    const cases: [Record<string, string>, string][] = [
      [{ ...base, fNumber: 'fast' }, 'fNumber'],
      [{ ...base, minThroughput: '80' }, 'minThroughput'],
      [{ ...base, line: 'Zz' }, 'line'],
      [{ ...base, label: '' }, 'label'],
      [{ ...base, nEff: '9' }, 'nEff'],
    ];
    for (const [q, field] of cases) {
      const res = await get(`/api/labels/odds?${new URLSearchParams(q)}`);
      expect(res.status, field).toBe(422);
      expect((await json(res)).details.map((d: { field?: string }) => d.field)).toContain(field);
    }
  });
});
