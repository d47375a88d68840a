import { afterAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn } from '../support/http';
import { query } from '../support/db';
import { metadataFor, singleCurve, submissionForm, HA_NM } from './submissions-fixtures';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

type Check = { code: string; level: string; message: string };

// Migration 0011 and docs/model.md §Polarised sets: s and p files of one unit give separate effective indices.
describe('a set measured in s and p light', () => {
  // The files follow λ(θ) = λ0·sqrt(1 − sin²θ/n²) with n_s = 1.95 and n_p = 1.85 (a high-index spacer: n_p < n_s);
  // the fit must find these closed-form indices again.
  const takes = [
    { aoiDeg: 0, polarization: 'unpolarized', nEff: 1.9 },
    { aoiDeg: 10, polarization: 's', nEff: 1.95 },
    { aoiDeg: 10, polarization: 'p', nEff: 1.85 },
    { aoiDeg: 20, polarization: 's', nEff: 1.95 },
    { aoiDeg: 20, polarization: 'p', nEff: 1.85 },
  ] as const;

  it('fits and stores n_eff,s and n_eff,p, keeps each file’s polarisation and temperature, and shows them', async () => {
    const contributor = await signIn('contributor@bandcone.test');
    const files = takes.map((t, i) => singleCurve(`sp${i}.csv`, { aoiDeg: t.aoiDeg, nEff: t.nEff, cwlNm: HA_NM }));
    const meta = metadataFor({
      method: { ...metadataFor().method, coating: 'hard' },
      files: files.map((f, i) => ({ name: f.name, aoiDeg: takes[i].aoiDeg, polarization: takes[i].polarization, temperatureC: 21 + i * 0.5 })),
    });
    const res = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm(files, meta) });
    expect(res.status, await res.clone().text()).toBe(201);
    const body = await json<{ curveIds: number[]; checks: Check[] }>(res);
    const sp = body.checks.filter((c) => c.code === 'set-neff-sp');
    expect(sp.map((c) => c.message.slice(0, 8))).toEqual(['s light:', 'p light:']);
    expect(sp.every((c) => c.level === 'info')).toBe(true);

    const rows = await query<{ id: number; s: number; p: number; pol: string; t: string; k: number | null }>(
      `SELECT id, n_eff_s AS s, n_eff_p AS p, method->>'polarization' AS pol, method->>'temperatureC' AS t, temp_coeff_nm_per_c AS k FROM curves WHERE id IN (:ids) ORDER BY id`,
      { ids: body.curveIds },
    );
    expect(rows).toHaveLength(5);
    for (const r of rows) {
      // CWLs read from 0.05 nm samples of a closed form: the indices within 0.02
      expect(Math.abs(r.s - 1.95)).toBeLessThan(0.02);
      expect(Math.abs(r.p - 1.85)).toBeLessThan(0.02);
    }
    expect(rows.map((r) => r.pol)).toEqual(takes.map((t) => t.polarization));
    expect(rows.map((r) => Number(r.t))).toEqual([21, 21.5, 22, 22.5, 23]);
    // s and p at one angle, half a degree apart, are not a temperature series
    expect(rows.every((r) => r.k === null)).toBe(true);

    // the curve's JSON and its page say so
    const detail = await json<{ derived: { nEffPolarised: { s: number; p: number } | null } }>(await contributor.fetch(`/api/curves/${rows[1].id}`));
    expect(detail.derived.nEffPolarised!.s).toBeCloseTo(rows[1].s, 9);
    const page = await (await contributor.fetch(`/curves/${rows[1].id}`)).text();
    expect(page).toContain('data-testid="derived-neff-sp"');
    expect(page).toMatch(/s 1\.9[45]\d* · p 1\.8[45]/);
  });

  it('p files at one angle only give no s/p fit, and the moderator is told why', async () => {
    const contributor = await signIn('contributor@bandcone.test');
    const only = submissionForm(
      [singleCurve('s10.csv', { aoiDeg: 10, nEff: 1.95 }), singleCurve('s20.csv', { aoiDeg: 20, nEff: 1.95 }), singleCurve('p20.csv', { aoiDeg: 20, nEff: 1.85 })],
      metadataFor({ files: [{ name: 's10.csv', aoiDeg: 10, polarization: 's' }, { name: 's20.csv', aoiDeg: 20, polarization: 's' }, { name: 'p20.csv', aoiDeg: 20, polarization: 'p' }] }),
    );
    const r2 = await contributor.fetch('/api/submissions', { method: 'POST', body: only });
    expect(r2.status, await r2.clone().text()).toBe(201);
    const b2 = await json<{ curveIds: number[]; checks: Check[] }>(r2);
    const why = b2.checks.find((c) => c.code === 'set-neff-sp')!;
    expect(why.message).toContain('two or more angles');
    const rows = await query<{ s: number | null }>(`SELECT n_eff_s AS s FROM curves WHERE id IN (:ids)`, { ids: b2.curveIds });
    expect(rows.every((r) => r.s === null)).toBe(true);
  });

  it('refuses a file polarisation outside the three words, with a sentence, nothing written', async () => {
    const contributor = await signIn('contributor@bandcone.test');
    const before = await query<{ n: string }>(`SELECT count(*) AS n FROM curves`);
    const files = [singleCurve('a.csv'), singleCurve('b.csv', { aoiDeg: 10 })];
    const meta = metadataFor({ files: [{ name: 'a.csv', aoiDeg: 0 }, { name: 'b.csv', aoiDeg: 10, polarization: 'circular' }] });
    const res = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm(files, meta) });
    expect(res.status).toBe(422);
    expect(((await res.json()) as { error: string }).error).toContain('polarization must be unpolarized, s or p');
    expect((await query<{ n: string }>(`SELECT count(*) AS n FROM curves`))[0].n).toBe(before[0].n);
  });

  it('the database keeps s and p together, and a verified curve’s fitted indices never change', async () => {
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'submitted' ORDER BY id LIMIT 1`);
    await expect(query(`UPDATE curves SET n_eff_s = 1.9, n_eff_p = NULL WHERE id = :id`, { id: c.id })).rejects.toThrow(/curves_n_eff_sp_pair/);
    const [v] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 1`);
    await expect(query(`UPDATE curves SET n_eff_s = 1.9, n_eff_p = 1.8 WHERE id = :id`, { id: v.id })).rejects.toThrow(/fitted indices/);
    await expect(query(`UPDATE curves SET temp_coeff_nm_per_c = 0.5 WHERE id = :id`, { id: v.id })).rejects.toThrow(/fitted indices and temperature coefficient/);
  });

  it('the cone response averages s and p: equal indices give the single-index answer, bad ones a 422 sentence', async () => {
    const visitor = anonymous();
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND 'Ha' = ANY(lines) ORDER BY id LIMIT 1`);
    const ask = async (extra: Record<string, unknown>) =>
      visitor.fetch('/api/model/cone', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ curveId: c.id, optic: { fNumber: 1.8, obstruction: 0 }, nEff: 1.9, lines: ['Ha'], ...extra }),
      });
    const one = (await (await ask({})).json()) as { lines: { throughput: number }[] };
    const same = (await (await ask({ nEffPolarised: { s: 1.9, p: 1.9 } })).json()) as { lines: { throughput: number }[] };
    expect(same.lines[0].throughput).toBeCloseTo(one.lines[0].throughput, 12);
    const split = (await (await ask({ nEffPolarised: { s: 2.1, p: 1.7 } })).json()) as { lines: { throughput: number }[] };
    expect(split.lines[0].throughput).not.toBeCloseTo(one.lines[0].throughput, 6);
    const bad = await ask({ nEffPolarised: { s: 0.5, p: 1.9 } });
    expect(bad.status).toBe(422);
    expect(((await bad.json()) as { error: string }).error).toContain('nEffPolarised.s must be between 1.0 and 4.0');
  });
});
