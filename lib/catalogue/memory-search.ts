/**
 * A fitness search over the public catalogue answered from the in-process copy
 * (memory-index.ts): the same filters, facet groups and order as the SQL in
 * search.ts, with τ summed over typed arrays. search.ts uses it for searches
 * without words whose readers see verified curves only; everything else runs
 * in SQL. tests/integration/catalogue-memory.test.ts holds the two answers equal.
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { lineThroughput } from '@/lib/engine/cone';
import { findLine } from '@/lib/engine/lines';
import type { Pupil } from '@/lib/engine/pupil';
import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';
import { FINE_INTERVALS, INTERVALS, SCALE, offNormalThroughput, type Weights } from './fitness-grid';
import { catalogueCopy, dropCatalogueCopy, fineBlock, gridBlock, StaleCopy, type FineBlock, type GridBlock, type Snapshot } from './memory-index';
import { FWHM_BUCKETS, hasFitness, type SearchParams, type Sort } from './search-params';

export type CountGroup = { instrument: string; bucket: number | null; lines: string[]; pf: boolean; n: string };

/** Searches the copy can answer: an optic, no words, and a reader who sees verified curves only. */
export function answeredInMemory(actor: Actor | null, p: SearchParams): p is SearchParams & { fNumber: number } {
  if (!hasFitness(p) || p.q) return false;
  return actor ? p.status === 'verified' : p.status === undefined || p.status === 'verified';
}

const THRESHOLDS = FWHM_BUCKETS.slice(1).map(([a]) => a);

/** PostgreSQL's width_bucket(x, thresholds): how many thresholds are ≤ x. */
function widthBucket(x: number): number {
  let k = 0;
  while (k < THRESHOLDS.length && THRESHOLDS[k] <= x) k++;
  return k;
}

/** Per-interval coefficients of the weighted sum: τ·SCALE = Σ_j coef[j]·mean[j] (the runs of `w`, un-regrouped). */
function coefficients(w: Weights): { coef: Float64Array; first: number; last: number } {
  const coef = new Float64Array(INTERVALS);
  // a term on running sum S[k] (1-based SQL index k + 1) counts every interval below k
  for (const t of w.terms) for (let j = 0; j < t.index - 1 && j < INTERVALS; j++) coef[j] += t.weight;
  let first = INTERVALS;
  let last = -1;
  for (let j = 0; j < INTERVALS; j++) {
    if (Math.abs(coef[j]) > 1e-15) {
      if (first === INTERVALS) first = j;
      last = j;
    }
  }
  return { coef, first, last };
}

interface Ordered {
  ids: number[];
  taus: (number | null)[];
  groups: CountGroup[];
}

export async function searchInMemory(p: SearchParams & { fNumber: number }, weights: Weights, pupil: Pupil, sort: Sort, dir: 'asc' | 'desc', page: number, pageSize: number): Promise<Ordered> {
  for (let attempt = 0; ; attempt++) {
    try {
      return await run(await catalogueCopy(), p, weights, pupil, sort, dir, page, pageSize);
    } catch (e) {
      if (!(e instanceof StaleCopy) || attempt >= 3) throw e;
      dropCatalogueCopy();
    }
  }
}

async function run(s: Snapshot, p: SearchParams & { fNumber: number }, w: Weights, pupil: Pupil, sort: Sort, dir: 'asc' | 'desc', page: number, pageSize: number): Promise<Ordered> {
  const n = s.n;
  const needTau = p.minThroughput !== undefined || sort === 'throughput';
  const namedLine = p.line ? (LINE_IDS as readonly string[]).indexOf(p.line) : -1;
  const contributor = p.contributor ? s.contributors.indexOf(p.contributor) : -1;
  const method = p.method ? (INSTRUMENTS as readonly string[]).indexOf(p.method) : -1;

  const common = (i: number): boolean =>
    (p.cwlMin === undefined || s.cwl[i] >= p.cwlMin) &&
    (p.cwlMax === undefined || s.cwl[i] <= p.cwlMax) &&
    (p.peakMin === undefined || s.peak[i] >= p.peakMin) &&
    (p.aoiMin === undefined || s.aoi[i] >= p.aoiMin) &&
    (p.aoiMax === undefined || s.aoi[i] <= p.aoiMax) &&
    (p.contributor === undefined || s.contributor[i] === contributor);
  const fwhmHolds = (i: number): boolean =>
    (p.fwhmMin === undefined || s.fwhm[i] >= p.fwhmMin) && (p.fwhmMax === undefined || s.fwhm[i] <= p.fwhmMax);

  let tau: Float64Array | null = null;
  if (needTau) {
    // the grid rows every candidate needs: the named line, or each curve's first line
    const wanted = new Set<number>();
    if (p.line) wanted.add(namedLine);
    else for (let i = 0; i < n; i++) if (s.firstLine[i] >= 0 && common(i)) wanted.add(s.firstLine[i]);
    const blocks: (GridBlock | undefined)[] = [];
    const fines: (FineBlock | undefined)[] = [];
    await Promise.all(
      [...wanted].map(async (li) => {
        blocks[li] = await gridBlock(s, LINE_IDS[li], w.level);
        if (p.nEff !== undefined) fines[li] = await fineBlock(s, LINE_IDS[li]);
      }),
    );
    const { coef, first, last } = coefficients(w);
    const canonicalFrame = w.frame === 'canonical-or-direct';
    const fineWidth = FINE_INTERVALS + 1;
    const exactNeeded: number[] = [];
    tau = new Float64Array(n).fill(NaN);
    for (let i = 0; i < n; i++) {
      if (!common(i)) continue;
      const li = p.line ? namedLine : s.firstLine[i];
      if (li < 0) continue;
      if (p.nEff !== undefined && s.aoi[i] > 0) {
        // brought to normal incidence with the named n_eff: from the fine level, as search.ts does
        const f = fines[li]!;
        const row = f.rowOf[i];
        // a curve targeting the line always has its fine level; without one, the whole curve (search.ts does the same)
        if (row < 0) {
          if (s.lineSets[s.lineSet[i]].includes(LINE_IDS[li])) exactNeeded.push(i);
        } else tau[i] = offNormalThroughput(f.sums.subarray(row * fineWidth, (row + 1) * fineWidth), s.aoi[i], p.nEff, pupil);
        continue;
      }
      const b = blocks[li];
      const row = b ? b.rowOf[i] : -1;
      if (!b || row < 0) continue;
      let arr = b.direct;
      let at = row * INTERVALS;
      if (canonicalFrame && b.canonRow[row] >= 0) {
        arr = b.canonical;
        at = b.canonRow[row] * INTERVALS;
      }
      let sum = 0;
      for (let j = first; j <= last; j++) sum += coef[j] * arr[at + j];
      tau[i] = sum / SCALE;
    }
    if (exactNeeded.length > 0) await exactFromPoints(s, p, pupil, exactNeeded, tau);
  }

  const groups = new Map<number, number>();
  const candidates: number[] = [];
  for (let i = 0; i < n; i++) {
    if (!common(i)) continue;
    if (p.minThroughput !== undefined && !(tau![i] >= p.minThroughput)) continue;
    const pf = fwhmHolds(i);
    const bucket = Number.isNaN(s.fwhm[i]) ? 0 : widthBucket(s.fwhm[i]) + 1;
    const key = ((s.lineSet[i] * 16 + bucket) * 8 + s.instrument[i]) * 2 + (pf ? 1 : 0);
    groups.set(key, (groups.get(key) ?? 0) + 1);
    const lineOk = !p.line || s.lineSets[s.lineSet[i]].includes(p.line);
    if (lineOk && (method < 0 || s.instrument[i] === method) && pf) candidates.push(i);
  }

  const top = firstInOrder(candidates, page * pageSize, comparator(s, sort, dir, tau));
  const shown = top.slice((page - 1) * pageSize, page * pageSize);
  return {
    ids: shown.map((i) => s.ids[i]),
    taus: shown.map((i) => (tau && !Number.isNaN(tau[i]) ? tau[i] : null)),
    groups: [...groups].map(([key, count]) => {
      const pf = key % 2 === 1;
      const instrument = Math.floor(key / 2) % 8;
      const bucket = Math.floor(key / 16) % 16;
      const set = Math.floor(key / 256);
      return { instrument: INSTRUMENTS[instrument], bucket: bucket === 0 ? null : bucket - 1, lines: s.lineSets[set], pf, n: String(count) };
    }),
  };
}

/** An off-normal curve without its fine level: the engine on the whole curve, as search.ts does. */
async function exactFromPoints(s: Snapshot, p: SearchParams & { fNumber: number }, pupil: Pupil, rows: number[], tau: Float64Array) {
  const found = await db().sequelize.query<{ id: number; n_eff: number | null; w: string; t: string }>(
    `SELECT id, n_eff, array_to_string(wavelength_nm, ',') AS w, array_to_string(transmission, ',') AS t FROM curves WHERE id = ANY($1::int[])`,
    { bind: [rows.map((i) => s.ids[i])], type: QueryTypes.SELECT },
  );
  const byId = new Map(found.map((r) => [r.id, r]));
  for (const i of rows) {
    const r = byId.get(s.ids[i]);
    const line = findLine(p.line ?? s.lineSets[s.lineSet[i]][0] ?? '');
    if (!r || !line) continue;
    const points = { wavelengthNm: r.w.split(',').map(Number), transmission: r.t.split(',').map(Number) };
    tau[i] = lineThroughput(points, pupil, line.airNm, { nEff: p.nEff!, measuredAoiDeg: s.aoi[i] }).throughput;
  }
}

/** The ORDER BY of search.ts (orderBy) over the copy: NULLs last except the oldest-first order, ties by id. */
function comparator(s: Snapshot, sort: Sort, dir: 'asc' | 'desc', tau: Float64Array | null): (a: number, b: number) => number {
  const desc = dir === 'desc';
  let vals: Float64Array;
  let nullsFirst = false;
  switch (sort) {
    case 'cwl':
      vals = s.cwl;
      break;
    case 'fwhm':
      vals = s.fwhm;
      break;
    case 'peak':
      vals = s.peak;
      break;
    case 'throughput':
      vals = tau!;
      break;
    default:
      // relevance without words is newest first
      vals = s.verifiedAt;
      nullsFirst = !desc;
  }
  return (a, b) => {
    const x = vals[a];
    const y = vals[b];
    const xn = Number.isNaN(x);
    const yn = Number.isNaN(y);
    if (xn !== yn) return (xn ? 1 : -1) * (nullsFirst ? -1 : 1);
    if (!xn && x !== y) return desc ? (y > x ? 1 : -1) : x > y ? 1 : -1;
    return desc ? s.ids[b] - s.ids[a] : s.ids[a] - s.ids[b];
  };
}

/** The first k of `items` in order, without sorting them all (k is a page or a few). */
function firstInOrder(items: number[], k: number, cmp: (a: number, b: number) => number): number[] {
  if (k >= items.length / 4) return items.sort(cmp).slice(0, k);
  const top: number[] = [];
  for (const it of items) {
    if (top.length === k && cmp(it, top[k - 1]) >= 0) continue;
    let lo = 0;
    let hi = top.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cmp(top[mid], it) <= 0) lo = mid + 1;
      else hi = mid;
    }
    top.splice(lo, 0, it);
    if (top.length > k) top.pop();
  }
  return top;
}
