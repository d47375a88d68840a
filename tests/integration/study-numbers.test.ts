import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

type ConeResult = {
  lines: { id: string; wavelengthNm: number; collimated: number; throughput: number; speedEquivalentFNumber: number | null }[];
  bestPreShift: { nm: number; throughput: number } | null;
  neighbours: { id: string; throughput: number }[];
  contrast: number | null;
  warnings: string[];
};

/** What a verdict card shows, read from the server-rendered page (the same numbers the browser then keeps up to date). */
type Shown = { throughput: number; throughputText: string; items: Map<string, { raw: number | null; text: string }>; line: string };

function readVerdicts(html: string): Shown[] {
  return html
    .split('data-testid="verdict"')
    .slice(1)
    .map((card) => {
      const tp = card.match(/data-testid="verdict-throughput" data-raw="([^"]*)"[^>]*>([\s\S]*?)<\/p>/)!;
      const items = new Map<string, { raw: number | null; text: string }>();
      for (const m of card.matchAll(/data-key="([^"]+)" data-raw="([^"]*)"[\s\S]*?data-testid="verdict-[^"]+">([\s\S]*?)<\/dd>/g)) {
        items.set(m[1], { raw: m[2] === '' ? null : Number(m[2]), text: m[3].replace(/<!-- -->/g, '') });
      }
      const line = card.match(/data-testid="verdict-line">([\s\S]*?)<\/p>/)![1].replace(/<!-- -->/g, '');
      return { throughput: Number(tp[1]), throughputText: tp[2].replace(/<!-- -->/g, ''), items, line };
    });
}

async function page(client: Client, search: string): Promise<{ html: string; verdicts: Shown[] }> {
  const res = await client.fetch(`/study?${search}`);
  expect(res.status).toBe(200);
  const html = await res.text();
  return { html, verdicts: readVerdicts(html) };
}

async function cone(client: Client, body: Record<string, unknown>): Promise<ConeResult> {
  const res = await client.fetch('/api/model/cone', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  expect(res.status, JSON.stringify(await res.clone().json())).toBe(200);
  return json<ConeResult>(res);
}

// Percent to one decimal, written here rather than borrowed from the app (docs/design.md §Type: transmission in % to 1 decimal).
const pct = (f: number) => `${(Math.round(f * 1000) / 10).toFixed(1)} %`;

async function curveRow(id: number) {
  const [row] = await query<{ n_eff: number | null; method: { temperatureC?: number }; lines: string[]; aoi_deg: number }>(
    'SELECT n_eff, method, lines, aoi_deg FROM curves WHERE id = :id',
    { id },
  );
  return row;
}

async function firstCurve(where: string) {
  const [row] = await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND ${where} ORDER BY id LIMIT 1`);
  return row.id;
}

function expectSame(shown: Shown, api: ConeResult) {
  const p = api.lines[0];
  expect(shown.throughput).toBeCloseTo(p.throughput, 12);
  expect(shown.throughputText).toBe(pct(p.throughput));
  const speed = shown.items.get('speed')!;
  if (p.speedEquivalentFNumber === null) expect(speed.text).toBe('f/∞');
  else {
    expect(speed.raw).toBeCloseTo(p.speedEquivalentFNumber, 12);
    expect(speed.text).toBe(`f/${p.speedEquivalentFNumber.toFixed(1)}`);
  }
  if (api.bestPreShift) expect(shown.items.get('best-shift')!.raw).toBeCloseTo(api.bestPreShift.nm, 12);
  for (const n of api.neighbours) {
    const item = shown.items.get(`neighbour-${n.id}`)!;
    expect(item.raw).toBeCloseTo(n.throughput, 12);
    expect(item.text).toBe(pct(n.throughput));
  }
  if (api.contrast !== null) expect(shown.items.get('contrast')!.raw).toBeCloseTo(api.contrast, 12);
}

describe('the study page shows what POST /api/model/cone answers for the same inputs', () => {
  let astrograph: { id: number; fNumber: number; obstruction: number; fieldAngleDeg: number };
  beforeAll(async () => {
    const { items } = await json<{ items: (typeof astrograph & { name: string })[] }>(await anonymous().fetch('/api/optics'));
    astrograph = items.find((o) => o.name.startsWith('Obstructed astrograph'))!;
  });

  it('for a single curve on an example optic, on axis and at the field edge', async () => {
    const id = await firstCurve(`'Ha' = ANY(lines) AND set_key IS NULL AND aoi_deg = 0`);
    const { verdicts } = await page(anonymous(), `curve=${id}&optic=${astrograph.id}`);
    expect(verdicts).toHaveLength(1);
    // No fitted value for a lone unit: the page uses n_eff 2.0, and so does this request.
    const api = await cone(anonymous(), { curveId: id, optic: { fNumber: astrograph.fNumber, obstruction: astrograph.obstruction }, nEff: 2, lines: ['Ha'] });
    expectSame(verdicts[0], api);
    expect(verdicts[0].line).toBe('Hα 656.28 nm');
    const edge = await cone(anonymous(), {
      curveId: id,
      optic: { fNumber: astrograph.fNumber, obstruction: astrograph.obstruction, fieldAngleDeg: astrograph.fieldAngleDeg },
      nEff: 2,
      lines: ['Ha'],
    });
    expect(verdicts[0].items.get('edge')!.raw).toBeCloseTo(edge.lines[0].throughput, 12);
  });

  it('for a unit of a measured set, with its fitted effective index, a pre-shift, temperature and a typed optic', async () => {
    const id = await firstCurve(`set_key IS NOT NULL AND n_eff IS NOT NULL AND aoi_deg = 0`);
    const row = await curveRow(id);
    const { verdicts } = await page(anonymous(), `curve=${id}&f=1.8&obs=0.3&shift=0.75&t=-5&k=0.016`);
    const refTempC = row.method.temperatureC ?? 20;
    const api = await cone(anonymous(), {
      curveId: id,
      optic: { fNumber: 1.8, obstruction: 0.3 },
      nEff: row.n_eff,
      preShiftNm: 0.75,
      tempC: -5,
      tempCoeffNmPerC: 0.016,
      refTempC,
      lines: [row.lines[0]],
    });
    expectSame(verdicts[0], api);
    expect(verdicts[0].items.get('neff')!.raw).toBeCloseTo(row.n_eff!, 12);
    // Δ = pre-shift + k·(t − t_ref) (docs/model.md §Pre-shift), computed here by hand.
    expect(verdicts[0].items.get('shift')!.raw).toBeCloseTo(0.75 + 0.016 * (-5 - refTempC), 12);
  });

  it('for a curve measured off normal, any wavelength, a receding source and the sine mapping', async () => {
    const id = await firstCurve('aoi_deg > 0 AND set_key IS NULL');
    const row = await curveRow(id);
    expect(row.aoi_deg).toBeGreaterThan(0);
    const { verdicts } = await page(anonymous(), `curve=${id}&f=2.8&obs=0.2&field=5&map=sine&n=1.85&line=656.1&v=120`);
    const api = await cone(anonymous(), {
      curveId: id,
      optic: { fNumber: 2.8, obstruction: 0.2, mapping: 'sine' },
      nEff: 1.85,
      lineNm: 656.1,
      radialVelocityKms: 120,
    });
    expectSame(verdicts[0], api);
    // λ(1 + v/c) with c = 299 792.458 km/s (docs/model.md §Lines).
    expect(api.lines[0].wavelengthNm).toBeCloseTo(656.1 * (1 + 120 / 299792.458), 9);
  });

  it('for several curves at once, each with its own numbers', async () => {
    const ids = (await query<{ id: number }>(`SELECT id FROM curves WHERE status = 'verified' AND 'OIII' = ANY(lines) AND set_key IS NULL ORDER BY id LIMIT 3`)).map((r) => r.id);
    const { verdicts } = await page(anonymous(), `curve=${ids.join(',')}&f=1.8&obs=0.42&line=OIII`);
    expect(verdicts).toHaveLength(3);
    for (const [i, id] of ids.entries()) {
      const api = await cone(anonymous(), { curveId: id, optic: { fNumber: 1.8, obstruction: 0.42 }, nEff: 2, lines: ['OIII'] });
      expectSame(verdicts[i], api);
    }
  });
});

describe('the study page respects who may see what', () => {
  it('does not show a visitor a curve that is not verified', async () => {
    const [hidden] = await query<{ id: number; contributor_id: string }>(`SELECT id, contributor_id FROM curves WHERE status = 'submitted' ORDER BY id LIMIT 1`);
    const { html, verdicts } = await page(anonymous(), `curve=${hidden.id}`);
    expect(verdicts).toHaveLength(0);
    expect(html.replace(/<!-- -->/g, '')).toContain(`C-${hidden.id}: not in the catalogue, or not visible to you.`);
    const [{ email }] = await query<{ email: string }>('SELECT email FROM users WHERE id = :id', { id: hidden.contributor_id });
    const owner = await signIn(email);
    expect((await page(owner, `curve=${hidden.id}`)).verdicts).toHaveLength(1);
  });

  it('uses a saved optic only for its owner', async () => {
    const a = await makeUser();
    const b = await makeUser();
    const ownerClient = await signIn(a.email, a.password);
    const other = await signIn(b.email, b.password);
    const saved = await json<{ id: number }>(
      await ownerClient.fetch('/api/optics', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Bench lens f/1.2', fNumber: 1.2 }) }),
    );
    const id = await firstCurve(`'Ha' = ANY(lines) AND set_key IS NULL AND aoi_deg = 0`);
    const mine = await page(ownerClient, `curve=${id}&optic=${saved.id}`);
    const api = await cone(anonymous(), { curveId: id, optic: { fNumber: 1.2, obstruction: 0 }, nEff: 2, lines: ['Ha'] });
    expectSame(mine.verdicts[0], api);
    const theirs = await page(other, `curve=${id}&optic=${saved.id}`);
    expect(theirs.html).toContain(`Optic ${saved.id} is not one you can use`);
    expect(theirs.verdicts[0].throughput).not.toBeCloseTo(api.lines[0].throughput, 6);
  });
});
