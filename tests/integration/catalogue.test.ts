import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { anonymous, json, signIn, type Client } from '../support/http';
import { count, query } from '../support/db';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';
import { closeSequelize } from '@/db/connection';
import { GRID_ERROR } from '@/lib/catalogue/grid-accuracy';

afterAll(() => closeSequelize());

type Item = {
  id: number; title: string; label: string; lines: string[]; cwlNm: number | null; fwhmNm: number | null; peakT: number; status: string;
  instrument: string; aoiDeg: number; throughput?: number; speedEquivalentFNumber?: number | null; snippet?: string;
  sparkline: { wavelengthNm: number[]; transmission: number[] };
};
type Page = { items: Item[]; total: number; page: number; pageSize: number; facets: { line: Facet[]; method: Facet[]; fwhm: Facet[] } };
type Facet = { key: string; count: number };

async function search(client: Client, qs: string): Promise<Page> {
  const res = await client.fetch(`/api/curves?${qs}`);
  expect(res.status, await res.clone().text()).toBe(200);
  return json<Page>(res);
}

/** Every page of a search, so "every result satisfies the filter" means every one. */
async function all(client: Client, qs: string): Promise<{ items: Item[]; total: number; first: Page }> {
  const first = await search(client, `${qs}&pageSize=100`);
  const items = [...first.items];
  for (let p = 2; (p - 1) * 100 < first.total; p++) items.push(...(await search(client, `${qs}&pageSize=100&page=${p}`)).items);
  expect(items.length).toBe(first.total);
  return { items, total: first.total, first };
}

/**
 * Verified units matching `where`: the catalogue lists a curve set measured at several angles once,
 * by its lowest-angle curve (docs/api.md §Catalogue items), written here as a window over each set
 * rather than the search's own NOT EXISTS. `cwl0` is the CWL at normal incidence,
 * λ0 = λθ / sqrt(1 − sin²θ / n²) with the fitted n_eff, else 2.0 (docs/model.md §Angle shift).
 */
const unitsOf = (where: string) => `(SELECT c.*, CASE WHEN aoi_deg > 0 THEN cwl_nm / sqrt(1 - (sin(radians(aoi_deg)) / CASE WHEN n_eff BETWEEN 1 AND 4 THEN n_eff ELSE 2 END) ^ 2) ELSE cwl_nm END AS cwl0,
  row_number() OVER (PARTITION BY coalesce(set_key || '|' || revision || '|' || status, 'c' || id) ORDER BY aoi_deg, id) AS k FROM curves c WHERE ${where}) u`;
const VERIFIED_UNITS = unitsOf(`status = 'verified'`);
const verifiedCount = (where = 'true') => count(VERIFIED_UNITS, `k = 1 AND ${where}`);

describe('every filter returns only curves that satisfy it', () => {
  const visitor = anonymous();

  it('line: every result targets the line, and none is missed', async () => {
    const { items, total } = await all(visitor, 'line=OIII');
    expect(items.every((i) => i.lines.includes('OIII'))).toBe(true);
    expect(total).toBe(await verifiedCount(`'OIII' = ANY(lines)`));
    expect(total).toBeGreaterThan(5);
  });

  it('CWL, FWHM, peak, instrument and measured AOI ranges hold for every result', async () => {
    const cases: [string, (i: Item) => boolean, string][] = [
      ['cwlMin=655&cwlMax=658', (i) => i.cwlNm! >= 655 && i.cwlNm! <= 658, 'cwl0 BETWEEN 655 AND 658'],
      ['fwhmMin=2&fwhmMax=5', (i) => i.fwhmNm! >= 2 && i.fwhmNm! <= 5, 'fwhm_nm BETWEEN 2 AND 5'],
      ['peakMin=0.92', (i) => i.peakT >= 0.92, 'peak_t >= 0.92'],
      ['method=monochromator', (i) => i.instrument === 'monochromator', `instrument = 'monochromator'`],
      ['aoiMin=4&aoiMax=12', (i) => i.aoiDeg >= 4 && i.aoiDeg <= 12, 'aoi_deg BETWEEN 4 AND 12'],
    ];
    for (const [qs, holds, where] of cases) {
      const { items, total } = await all(visitor, qs);
      expect(total, qs).toBeGreaterThan(0);
      expect(items.filter((i) => !holds(i)).map((i) => i.id), qs).toEqual([]);
      expect(total, qs).toBe(await verifiedCount(where));
    }
  });

  it('contributor: only that contributor’s curves', async () => {
    const [who] = await query<{ contributor_id: string; n: string }>(
      `SELECT contributor_id, count(*) AS n FROM ${VERIFIED_UNITS} WHERE k = 1 GROUP BY 1 ORDER BY 2 DESC LIMIT 1`,
    );
    const { items, total } = await all(visitor, `contributor=${who.contributor_id}`);
    expect(total).toBe(Number(who.n));
    const owners = await query<{ contributor_id: string }>('SELECT DISTINCT contributor_id FROM curves WHERE id IN (:ids)', { ids: items.map((i) => i.id) });
    expect(owners.map((o) => o.contributor_id)).toEqual([who.contributor_id]);
  });

  it('words: English stemming finds a plural’s singular, and every hit carries the word', async () => {
    // "substrates" stems to the same lexeme as "substrate" (Snowball English stemmer, the one PostgreSQL's 'english' configuration uses)
    const { items, total } = await all(visitor, 'q=substrates');
    expect(total).toBeGreaterThan(0);
    const texts = await query<{ id: number; text: string }>(
      `SELECT id, concat_ws(' ', label, maker, lab, notes, serial) AS text FROM curves WHERE id IN (:ids)`,
      { ids: items.map((i) => i.id) },
    );
    expect(texts.every((t) => /substrate/i.test(t.text))).toBe(true);
    expect(total).toBe(await verifiedCount(`concat_ws(' ', label, maker, lab, notes, serial) ~* 'substrate'`));
    const first = (await search(visitor, 'q=substrates')).items[0];
    expect(first.snippet).toMatch(/<mark>substrate/i);
  });

  it('words name lines the way people write them', async () => {
    const a = await search(visitor, 'q=hydrogen+alpha');
    const b = await search(visitor, 'q=H-alpha');
    const c = await search(visitor, 'line=Ha');
    expect(a.total).toBe(c.total);
    expect(b.total).toBe(c.total);
  });

  it('facets count the other choices of each filter', async () => {
    const page = await search(visitor, 'line=Ha&fwhmMax=5');
    expect(page.facets.line.find((f) => f.key === 'Ha')?.count).toBe(page.total);
    expect(page.facets.method.reduce((s, f) => s + f.count, 0)).toBe(page.total);
    // the FWHM facet leaves out the FWHM filter: it counts every Hα unit with a FWHM
    expect(page.facets.fwhm.reduce((s, f) => s + f.count, 0)).toBe(await verifiedCount(`'Ha' = ANY(lines) AND fwhm_nm IS NOT NULL`));
    const three = page.facets.fwhm.find((f) => f.key === '3-4');
    if (three) expect((await search(visitor, 'line=Ha&fwhmMin=3&fwhmMax=3.99999')).total).toBe(three.count);
  });

  it('sorts and pages', async () => {
    const byCwl = await all(visitor, 'line=Ha&sort=cwl');
    const cwls = byCwl.items.map((i) => i.cwlNm!);
    expect(cwls).toEqual([...cwls].sort((a, b) => a - b));
    const byPeak = (await search(visitor, 'sort=peak&pageSize=30')).items.map((i) => i.peakT);
    expect(byPeak).toEqual([...byPeak].sort((a, b) => b - a));
    const p1 = await search(visitor, 'sort=fwhm&pageSize=10');
    const p2 = await search(visitor, 'sort=fwhm&pageSize=10&page=2');
    expect(p1.items.some((i) => p2.items.some((j) => j.id === i.id))).toBe(false);
    expect(p2.items[0].fwhmNm!).toBeGreaterThanOrEqual(p1.items[9].fwhmNm!);
    expect(p1.items.every((i) => i.sparkline.wavelengthNm.length > 5 && i.sparkline.wavelengthNm.length <= 60)).toBe(true);
  });

  it('refuses bad parameters with 422 and a readable sentence', async () => {
    for (const qs of ['fwhmMax=narrow', 'pageSize=500', 'minThroughput=0.8', 'cwlMin=660&cwlMax=650', 'line=Halpha']) {
      const res = await visitor.fetch(`/api/curves?${qs}`);
      expect(res.status, qs).toBe(422);
      const body = await json<{ error: string; details: { field?: string }[] }>(res);
      expect(body.error).toMatch(/^The request is not valid: .+\.$/);
      expect(body.details[0].field).toBeTruthy();
    }
  });
});

describe('fitness for an optic', () => {
  const visitor = anonymous();
  const optic = 'fNumber=2.5&obstruction=0.36';

  it('gives each result its exact throughput and speed-equivalent f-number, as the cone model does', async () => {
    const page = await search(visitor, `line=Ha&${optic}&sort=throughput&pageSize=5`);
    expect(page.items.length).toBe(5);
    for (const item of page.items.slice(0, 3)) {
      const [c] = await query<{ n_eff: number | null }>('SELECT n_eff FROM curves WHERE id = :id', { id: item.id });
      const res = await visitor.fetch('/api/model/cone', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ curveId: item.id, optic: { fNumber: 2.5, obstruction: 0.36 }, nEff: c.n_eff ?? 2.0, lines: ['Ha'] }),
      });
      const model = await json<{ lines: { id: string; throughput: number; speedEquivalentFNumber: number }[] }>(res);
      expect(item.throughput).toBeCloseTo(model.lines[0].throughput, 10);
      expect(item.speedEquivalentFNumber).toBeCloseTo(model.lines[0].speedEquivalentFNumber, 10);
      // docs/model.md §Throughput: N_eq = N · sqrt(T_peak / τ)
      expect(item.speedEquivalentFNumber!).toBeCloseTo(2.5 * Math.sqrt(item.peakT / item.throughput!), 8);
    }
  });

  it('minThroughput keeps exactly the curves that reach it, within the grid’s documented error', async () => {
    const min = 0.6;
    const kept = new Set((await all(visitor, `line=Ha&${optic}&minThroughput=${min}`)).items.map((i) => i.id));
    const everyHa = (await all(visitor, `line=Ha&${optic}`)).items;
    expect(everyHa.length).toBeGreaterThan(kept.size);
    expect(kept.size).toBeGreaterThan(0);
    // every result on a page carries its exact value; compare them with the filter's decision
    for (const i of everyHa) {
      if (i.throughput! >= min + GRID_ERROR.max) expect(kept.has(i.id), `curve ${i.id} τ=${i.throughput}`).toBe(true);
      if (i.throughput! < min - GRID_ERROR.max) expect(kept.has(i.id), `curve ${i.id} τ=${i.throughput}`).toBe(false);
    }
  });

  it('sorts by throughput, best first', async () => {
    const items = (await search(visitor, `line=OIII&fNumber=1.8&obstruction=0.2&sort=throughput&pageSize=30`)).items;
    for (let k = 1; k < items.length; k++) expect(items[k].throughput!).toBeLessThanOrEqual(items[k - 1].throughput! + 2 * GRID_ERROR.max);
  });

  it('a named n_eff and a field angle reach the engine too', async () => {
    const items = (await search(visitor, `line=Ha&fNumber=2.8&obstruction=0.3&nEff=1.7&fieldAngleDeg=8&sort=throughput&pageSize=3`)).items;
    const res = await visitor.fetch('/api/model/cone', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ curveId: items[0].id, optic: { fNumber: 2.8, obstruction: 0.3, fieldAngleDeg: 8 }, nEff: 1.7, lines: ['Ha'] }),
    });
    expect(items[0].throughput).toBeCloseTo((await json(res)).lines[0].throughput, 10);
  });
});

describe('unverified curves never reach visitors', () => {
  let hidden: number[] = [];
  beforeAll(async () => {
    hidden = (await query<{ id: number }>(`SELECT id FROM curves WHERE status NOT IN ('verified') ORDER BY id`)).map((r) => r.id);
  });

  it('not in any search, page or export', async () => {
    expect(hidden.length).toBeGreaterThan(0);
    const { items, total } = await all(anonymous(), 'sort=newest');
    expect(total).toBe(await verifiedCount());
    expect(items.every((i) => i.status === 'verified')).toBe(true);
    const csv = await (await anonymous().fetch('/api/curves/export.csv')).text();
    const ids = new Set(Papa.parse<string[]>(csv, { comments: '#' }).data.slice(1).map((r) => Number(r[0])));
    for (const id of hidden) expect(ids.has(id)).toBe(false);
  });

  it('not by id either: 404 for the curve, its points and its files', async () => {
    const [submitted] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'submitted' ORDER BY id LIMIT 1`);
    for (const path of ['', '/points', '/csv', '/json']) {
      const res = await anonymous().fetch(`/api/curves/${submitted.id}${path}`);
      expect(res.status, path).toBe(404);
    }
  });

  it('status filters are for moderators; contributors see their own beside the verified', async () => {
    expect((await anonymous().fetch('/api/curves?status=submitted')).status).toBe(403);
    const moderator = await signIn('moderator@bandcone.test');
    const waiting = await all(moderator, 'status=submitted');
    expect(waiting.total).toBe(await count(unitsOf(`status = 'submitted'`), 'k = 1'));
    expect(waiting.items.every((i) => i.status === 'submitted')).toBe(true);

    const [owner] = await query<{ email: string; id: string }>(
      `SELECT u.email, u.id FROM curves c JOIN users u ON u.id = c.contributor_id WHERE c.status = 'submitted' ORDER BY c.id LIMIT 1`,
    );
    const contributor = await signIn(owner.email);
    const mine = await all(contributor, 'sort=newest');
    const others = mine.items.filter((i) => i.status !== 'verified');
    expect(others.length).toBe(await count(unitsOf(`status NOT IN ('verified', 'superseded') AND contributor_id = '${owner.id}'`), 'k = 1'));
    const strangers = await query<{ id: number }>(`SELECT id FROM curves WHERE status <> 'verified' AND contributor_id <> '${owner.id}'`);
    expect(mine.items.some((i) => strangers.some((s) => s.id === i.id))).toBe(false);
  });
});

describe('downloads', () => {
  it('a curve’s CSV reads back through the upload reader unchanged', async () => {
    const [c] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 1`);
    const csvRes = await anonymous().fetch(`/api/curves/${c.id}/csv`);
    expect(csvRes.headers.get('content-type')).toMatch(/text\/csv/);
    const csv = await csvRes.text();
    expect(csv.startsWith('# bandcone curve')).toBe(true);
    expect(csv).toMatch(/^# citation: .+Bandcone curve \d+/m);
    const form = new FormData();
    form.append('file', new Blob([csv], { type: 'text/csv' }), `curve-${c.id}.csv`);
    const preview = await json<{ points: { wavelengthNm: number[]; transmission: number[] } }>(await anonymous().fetch('/api/curves/preview', { method: 'POST', body: form }));
    const stored = await json<{ wavelengthNm: number[]; transmission: number[] }>(await anonymous().fetch(`/api/curves/${c.id}/points`));
    expect(preview.points.wavelengthNm).toEqual(stored.wavelengthNm);
    expect(preview.points.transmission).toEqual(stored.transmission);
  });

  it('exported cells cannot start a formula, whatever a contributor typed', async () => {
    // a label and notes written to attack a spreadsheet (OWASP "CSV Injection")
    const contributor = await signIn('contributor2@bandcone.test');
    const moderator = await signIn('moderator@bandcone.test');
    const label = `=HYPERLINK("http://example.invalid/x","Hα ${Date.now()}")`;
    const up = await contributor.fetch('/api/submissions', {
      method: 'POST',
      body: submissionForm([singleCurve('inject.csv')], metadataFor({ label, maker: '+Evil, -Works', serial: '@SUM(1+1)', notes: 'plain words, =1+1, and more' })),
    });
    expect(up.status).toBe(201);
    const { id, curveIds } = await json<{ id: number; curveIds: number[] }>(up);
    const review = await moderator.fetch(`/api/submissions/${id}/review`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'verify', note: 'checked' }),
    });
    expect(review.status).toBe(200);
    // verifying filled the curve's fitness grid in the same transaction
    expect(await count('curve_fitness', `curve_id = ${curveIds[0]}`)).toBe(4);

    const [me] = await query<{ contributor_id: string }>('SELECT contributor_id FROM curves WHERE id = :id', { id: curveIds[0] });
    const res = await anonymous().fetch(`/api/curves/export.csv?contributor=${me.contributor_id}`);
    expect(res.status).toBe(200);
    const text = await res.text();
    expect(text).toContain(`# curve ${curveIds[0]}`);
    const rows = Papa.parse<string[]>(text).data;
    const cells = rows.flat();
    const formula = cells.filter((cell) => /^\s*[=+\-@\t\r]/.test(cell));
    expect(formula).toEqual([]);
    expect(rows.some((r) => r[0] === '# label' && r[1] === `'${label}`)).toBe(true);
    const dataRows = rows.filter((r) => r[0] === String(curveIds[0]));
    expect(dataRows.length).toBeGreaterThan(100);

    const jsonExport = await json<{ curves: { id: number; label: string; points: { wavelengthNm: number[] } }[] }>(
      await anonymous().fetch(`/api/curves/export.json?contributor=${me.contributor_id}`),
    );
    const mine = jsonExport.curves.find((c) => c.id === curveIds[0])!;
    expect(mine.label).toBe(label);
    expect(mine.points.wavelengthNm.length).toBe(dataRows.length);
  });

  it('exports hold verified curves only and say so', async () => {
    const res = await anonymous().fetch('/api/curves/export.csv?status=submitted');
    expect(res.status).toBe(422);
    expect((await json(res)).error).toMatch(/verified curves only/);
  });
});

describe('a curve', () => {
  it('answers with its method, derived numbers, revision, public review and unit spread', async () => {
    const [c] = await query<{ id: number; label: string }>(
      `SELECT id, label FROM curves WHERE status = 'verified' AND aoi_deg = 0 AND label IN (
         SELECT label FROM curves WHERE status = 'verified' AND aoi_deg = 0 GROUP BY label HAVING count(*) >= 3) ORDER BY id LIMIT 1`,
    );
    const d = await json(await anonymous().fetch(`/api/curves/${c.id}`));
    expect(d.label).toBe(c.label);
    expect(d.method.instrument).toBeTruthy();
    expect(d.derived.fwhmNm).toBeGreaterThan(0);
    expect(d.revision).toBe(1);
    expect(d.reviews[0].kind).toBe('verify');
    const units = await query<{ cwl_nm: number }>(`SELECT cwl_nm FROM curves WHERE status = 'verified' AND aoi_deg = 0 AND label = :label`, { label: c.label });
    expect(d.unitSpread.count).toBe(units.length);
    const mean = units.reduce((s, u) => s + u.cwl_nm, 0) / units.length;
    expect(d.unitSpread.cwl.mean).toBeCloseTo(mean, 9);
    expect(d.citation).toContain(`Bandcone curve ${c.id}`);
    expect((await anonymous().fetch('/api/curves/999999999')).status).toBe(404);
    expect((await anonymous().fetch('/api/curves/abc')).status).toBe(404);
  });
});
