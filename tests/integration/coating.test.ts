import { afterAll, describe, expect, it } from 'vitest';
import { json, signIn } from '../support/http';
import { query } from '../support/db';
import { metadataFor, singleCurve, submissionForm, HA_NM } from './submissions-fixtures';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

// Migration 0006: the coating travels in the method; a set measured at several temperatures gets its dCWL/dT fitted.
describe('coating type and temperature sets', () => {
  it('one unit at −10, 5 and 20 °C: dCWL/dT is fitted from the CWLs and stored on its curves', async () => {
    const contributor = await signIn('contributor@bandcone.test');
    const k = 0.015; // a soft coating (W. J. Smith: 0.01–0.02 nm/°C)
    const temps = [-10, 5, 20];
    const files = temps.map((t, i) => singleCurve(`t${i}.csv`, { cwlNm: HA_NM + k * (t - 20) }));
    const meta = metadataFor({
      method: { ...metadataFor().method, coating: 'soft' },
      files: files.map((f, i) => ({ name: f.name, aoiDeg: 0, temperatureC: temps[i] })),
    });
    const res = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm(files, meta) });
    expect(res.status, await res.clone().text()).toBe(201);
    const body = await json<{ id: number; curveIds: number[]; checks: { code: string; level: string; message: string }[] }>(res);
    const temp = body.checks.find((c) => c.code === 'set-temp')!;
    expect(temp.level).toBe('info');
    expect(temp.message).toMatch(/dCWL\/dT 0\.01[45]\d nm\/°C/);
    const rows = await query<{ coating: string; k: number }>(`SELECT coating, temp_coeff_nm_per_c AS k FROM curves WHERE id IN (:ids)`, { ids: body.curveIds });
    expect(rows).toHaveLength(3);
    for (const r of rows) {
      expect(r.coating).toBe('soft');
      // CWLs read from 0.05 nm samples: the slope within 10 %
      expect(Math.abs(r.k - k) / k).toBeLessThan(0.1);
    }
  });

  it('an unknown coating word is refused with a sentence, nothing written', async () => {
    const contributor = await signIn('contributor@bandcone.test');
    const before = await query<{ n: string }>(`SELECT count(*) AS n FROM curves`);
    const meta = metadataFor({ method: { ...metadataFor().method, coating: 'magic' } });
    const res = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve()], meta) });
    expect(res.status).toBe(422);
    expect(((await res.json()) as { error: string }).error).toContain('coating must be hard, soft or unknown');
    const after = await query<{ n: string }>(`SELECT count(*) AS n FROM curves`);
    expect(after[0].n).toBe(before[0].n);
  });

  it('the database refuses a coating outside the three words even past the API', async () => {
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'submitted' ORDER BY id LIMIT 1`);
    await expect(query(`UPDATE curves SET method = method || '{"coating":"magic"}'::jsonb WHERE id = :id`, { id: c.id })).rejects.toThrow(/curves_method_coating/);
  });
});
