import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { anonymous, json } from '../support/http';
import { count, query } from '../support/db';
import { closeSequelize, getSequelize } from '@/db/connection';
import { GRID_ERROR } from '@/lib/catalogue/grid-accuracy';
import type { SearchResult } from '@/lib/catalogue/search';
import { forgetCounts } from '@/lib/catalogue/count-cache';
import { unitLeadSql } from '@/lib/catalogue/units';

afterAll(() => closeSequelize());

const visitor = anonymous();

async function search(qs: string): Promise<SearchResult> {
  const res = await visitor.fetch(`/api/curves?${qs}`);
  expect(res.status, await res.clone().text()).toBe(200);
  return json<SearchResult>(res);
}

async function refused(qs: string): Promise<{ error: string; details: { field?: string; message: string }[] }> {
  const res = await visitor.fetch(`/api/curves?${qs}`);
  expect(res.status).toBe(422);
  return json(res);
}

// the catalogue lists one row per unit (a set's lead curve, lib/catalogue/units.ts), so counts are of leads
const verified = (where: string) => count('curves', `status = 'verified' AND ${where} AND ${unitLeadSql('curves')}`);

describe('words with numbers (GET /api/curves?q=…)', () => {
  it('"H-alpha 5 nm" is the line and a width within ±20 %, and finds exactly those curves', async () => {
    for (const q of ['H-alpha 5 nm', 'Hα 5nm', 'Halpha 50 Å', 'ha 5 nm']) {
      const r = await search(`q=${encodeURIComponent(q)}&pageSize=100`);
      expect(r.understood?.map((u) => [u.kind, u.params, u.applied]), q).toEqual([
        ['line', { line: 'Ha' }, true],
        ['width', { fwhmMin: 4, fwhmMax: 6 }, true],
      ]);
      expect(r.words).toBe('');
      expect(r.total, q).toBe(await verified(`'Ha' = ANY(lines) AND fwhm_nm BETWEEN 4 AND 6`));
      expect(r.total).toBeGreaterThan(0);
      for (const i of r.items) {
        expect(i.lines).toContain('Ha');
        expect(i.fwhmNm!).toBeGreaterThanOrEqual(4);
        expect(i.fwhmNm!).toBeLessThanOrEqual(6);
      }
    }
  });

  it('the other spellings of lines, and words that stay words', async () => {
    for (const [q, id] of [['[O III]', 'OIII'], ['O3', 'OIII'], ['OIII', 'OIII'], ['S2', 'SII-671'], ['SII', 'SII-671']] as const) {
      const r = await search(`q=${encodeURIComponent(q)}`);
      expect(r.understood?.[0]?.params, q).toEqual({ line: id });
      expect(r.total, q).toBe(await verified(`'${id}' = ANY(lines)`));
    }
    const mixed = await search(`q=${encodeURIComponent('OIII f/2 80 % zzzqqq obstruction 0.3')}`);
    expect(mixed.understood?.map((u) => u.kind)).toEqual(['line', 'optic', 'threshold', 'obstruction']);
    expect(mixed.understood?.find((u) => u.kind === 'threshold')?.params).toEqual({ minThroughput: 0.8 });
    expect(mixed.words).toBe('zzzqqq');
    expect(mixed.fitness).toMatchObject({ fNumber: 2, obstruction: 0.3, lineId: 'OIII' });
  });

  it('"3 nm" does not rank a 4.5 nm filter first because its notes say "3-cavity"', async () => {
    const sequelize = getSequelize();
    const [near] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND fwhm_nm BETWEEN 4.2 AND 4.8 ORDER BY id LIMIT 1`);
    expect(near).toBeDefined();
    // a verified copy whose notes say "3-cavity" (inserted verified, as the catalogue-memory test does)
    const [{ id }] = await sequelize.query<{ id: number }>(
      `INSERT INTO curves (submission_id, file_id, contributor_id, status, label, maker, lines, serial, notes, licence, method, instrument, aoi_deg,
                           wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
                           blocking_od, line_transmission, n_eff, verified_at)
       SELECT NULL, NULL, contributor_id, 'verified', label || ' (3-cavity test)', maker, lines, serial, 'A 3-cavity design, 3 nm of spacer.', licence, method, instrument, aoi_deg,
              wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
              blocking_od, line_transmission, n_eff, now()
       FROM curves WHERE id = $1 RETURNING id`,
      { bind: [near.id], type: QueryTypes.SELECT },
    );
    forgetCounts();
    try {
      // as words, the notes find it
      expect((await search('q=3-cavity')).items.map((i) => i.id)).toContain(id);
      const r = await search('q=3%20nm&pageSize=100');
      expect(r.understood?.[0]).toMatchObject({ kind: 'width', params: { fwhmMin: 2.4, fwhmMax: 3.6 } });
      expect(r.words).toBe('');
      expect(r.items.map((i) => i.id)).not.toContain(id);
      expect(r.items.length).toBeGreaterThan(0);
      for (const i of r.items) expect(Math.abs(i.fwhmNm! - 3)).toBeLessThanOrEqual(0.6 + 1e-9);
    } finally {
      await sequelize.transaction(async (transaction) => {
        await sequelize.query(`SET LOCAL bandcone.maintenance = 'on'`, { transaction });
        await sequelize.query(`DELETE FROM curves WHERE id = $1`, { bind: [id], transaction });
      });
      forgetCounts();
    }
  });

  it('an explicit parameter wins over the words of the same kind', async () => {
    const r = await search(`q=${encodeURIComponent('Hα 5 nm')}&fwhmMin=2&fwhmMax=9`);
    expect(r.understood?.map((u) => [u.kind, u.applied])).toEqual([['line', true], ['width', false]]);
    expect(r.total).toBe(await verified(`'Ha' = ANY(lines) AND fwhm_nm BETWEEN 2 AND 9`));
  });

  it('hostile words are answered (200 or a 422 for length), never a 5xx', async () => {
    for (const q of ['f/'.repeat(100), '9'.repeat(200), '['.repeat(100) + ']'.repeat(100), '%'.repeat(200), 'H-'.repeat(99) + 'a', '😀'.repeat(100)]) {
      const res = await visitor.fetch(`/api/curves?q=${encodeURIComponent(q)}`);
      expect([200, 422], q.slice(0, 20)).toContain(res.status);
    }
    const tooLong = await visitor.fetch(`/api/curves?q=${'a'.repeat(201)}`);
    expect(tooLong.status).toBe(422);
  });
});

describe('a search that ends nowhere says what is nearest, with true counts', () => {
  it('names the best throughput on the optic, and each relaxation finds the number it says', async () => {
    const qs = 'line=Ha&fNumber=2&obstruction=0.36&minThroughput=0.99&fwhmMax=3&nEff=1.6';
    const r = await search(qs);
    expect(r.total).toBe(0);
    expect(r.nearest).toBeDefined();
    const n = r.nearest!;
    // the best exact throughput is what the throughput order puts first without the threshold
    const best = await search(qs.replace('minThroughput=0.99', 'sort=throughput&pageSize=1'));
    expect(n.bestThroughput).toBeCloseTo(best.items[0].throughput!, 12);
    expect(n.bestThroughput!).toBeLessThan(0.99 + GRID_ERROR.max);
    const labels = n.relaxations.map((x) => x.label);
    expect(labels[0]).toMatch(/^the best is \d+(\.\d+)? % — show those$/);
    expect(labels).toEqual(expect.arrayContaining(['any line throughput', 'any FWHM', 'any n_eff (each curve its own)']));
    expect(labels.some((l) => l.startsWith('a wider FWHM'))).toBe(true);
    // every count is the total of the search it names
    for (const x of n.relaxations) {
      const u = new URLSearchParams(qs);
      for (const [k, v] of Object.entries(x.params)) v === null ? u.delete(k) : u.set(k, v);
      expect((await search(u.toString())).total, x.label).toBe(x.total);
    }
    // "show those" finds the best curve itself
    const show = n.relaxations[0];
    expect(show.total).toBeGreaterThan(0);
    const u = new URLSearchParams(qs);
    for (const [k, v] of Object.entries(show.params)) v === null ? u.delete(k) : u.set(k, v);
    expect((await search(u.toString())).items.map((i) => i.id)).toContain(best.items[0].id);
  });

  it('a relaxation of a filter read from the words takes those words out of the box', async () => {
    const r = await search(`q=${encodeURIComponent('Hα 0.3 nm')}`);
    expect(r.total).toBe(0);
    const any = r.nearest!.relaxations.find((x) => x.label === 'any FWHM')!;
    expect(any.params).toMatchObject({ fwhmMin: null, fwhmMax: null, q: 'Hα' });
    expect(any.total).toBe(await verified(`'Ha' = ANY(lines)`));
  });

  it('a search that finds curves carries no nearest', async () => {
    expect((await search('line=Ha')).nearest).toBeUndefined();
  });
});

describe('number parameters read as people type them (one rule with the fields)', () => {
  it('f/2, 40 % and 80 % are the numbers they say; a bad one is refused naming its field', async () => {
    const typed = await search(`fNumber=${encodeURIComponent('f/2')}&obstruction=${encodeURIComponent('40 %')}&minThroughput=80%25&line=Ha`);
    const plain = await search('fNumber=2&obstruction=0.4&minThroughput=0.8&line=Ha');
    expect(typed.fitness).toEqual(plain.fitness);
    expect(typed.total).toBe(plain.total);
    expect((await search('fNumber=2&obstruction=40&line=Ha')).fitness?.obstruction).toBe(0.4);
    const bad = await refused('fNumber=2&obstruction=lots');
    expect(bad.details[0]).toEqual({ field: 'obstruction', message: 'Obstruction: “lots” is not a number such as 0.4, 40 or 40 %' });
  });
});

describe('FWHM buckets and the order an optic brings', () => {
  it('several buckets at once find the curves of any of them, and the facet still counts each', async () => {
    const r = await search('fwhmBucket=2-3&fwhmBucket=3-4&pageSize=100');
    expect(r.total).toBe(await verified('fwhm_nm >= 2 AND fwhm_nm < 4'));
    expect(r.total).toBeGreaterThan(0);
    for (const i of r.items) expect(i.fwhmNm! >= 2 && i.fwhmNm! < 4).toBe(true);
    expect(r.facets.fwhm.find((f) => f.key === '5-7')?.count).toBe(await verified('fwhm_nm >= 5 AND fwhm_nm < 7'));
    expect((await search('fwhmBucket=2-3,3-4')).total).toBe(r.total);
    expect((await refused('fwhmBucket=2-4')).details[0].field).toMatch(/^fwhmBucket/);
  });

  it('with an optic the order is line throughput unless another is asked for', async () => {
    const r = await search('line=Ha&fNumber=2.5&obstruction=0.36');
    expect(r.sort).toBe('throughput');
    const taus = r.items.map((i) => i.throughput!);
    // exact values of an order kept by the grid: never out of order by more than its error
    for (let k = 1; k < taus.length; k++) expect(taus[k]).toBeLessThanOrEqual(taus[k - 1] + 2 * GRID_ERROR.max);
    expect((await search('line=Ha&fNumber=2.5&sort=newest')).sort).toBe('newest');
    expect((await search('line=Ha')).sort).toBe('newest');
  });
});
