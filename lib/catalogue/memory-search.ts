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
import { searchWithinPublic } from '@/lib/auth/policy';
import { lineThroughput } from '@/lib/engine/cone';
import { findLine } from '@/lib/engine/lines';
import type { Pupil } from '@/lib/engine/pupil';
import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';
import { FINE_INTERVALS, LEVEL_LENGTH, SCALE, applyOffNormal, offNormalCoefficients, offNormalThroughput, type OffNormalCoefficients, type Weights } from './fitness-grid';
import { curvePointsByIds } from './points';
import { catalogueCopy, dropCatalogueCopy, fineBlock, gridBlock, StaleCopy, unitLeadsOf, type FineBlock, type GridBlock, type Snapshot } from './memory-index';
import { hasFitness, type SearchParams, type Sort } from './search-params';
import { activeFilters, bucketIndex, groupKey, groupOf, GROUPS_PER_LINE_SET, nullsFirst, PACKING, SORT_COLUMNS, type Filter } from './filters';

export type CountGroup = { instrument: string; bucket: number | null; lines: string[]; pf: boolean; n: string };

/**
 * Searches the copy can answer: an optic, no words, and a reader who sees verified curves only,
 * which is every visitor, anyone asking for status=verified, and a contributor with no curve of
 * their own awaiting a decision or turned down (their search would show those too, search.ts).
 */
export async function answeredInMemory(actor: Actor | null, p: SearchParams): Promise<boolean> {
  if (!hasFitness(p) || p.q) return false;
  const within = searchWithinPublic(actor, p.status);
  if (within !== 'unless-own-open') return within === 'yes';
  const own = await db().sequelize.query(
    `SELECT 1 FROM curves WHERE contributor_id = $1::uuid AND status IN ('submitted', 'changes_requested', 'rejected') LIMIT 1`,
    { bind: [actor!.id], type: QueryTypes.SELECT },
  );
  return own.length === 0;
}

/** Off-normal curves at one AOI computed one by one before their shared coefficients are worked out (about a slice's width of work). */
const SHARED_AOI_ROWS = 24;

/** The weighted sum's terms as typed arrays: τ·SCALE = Σ weight·S[offset], S a level's running sums. */
function termsOf(w: Weights): { at: Int32Array; weight: Float64Array } {
  return { at: Int32Array.from(w.terms, (t) => t.index - 1), weight: Float64Array.from(w.terms, (t) => t.weight) };
}

interface Ordered {
  ids: number[];
  taus: (number | null)[];
  groups: CountGroup[];
}

/** The answer from the copy, or null when the library kept changing under three reads of it (search.ts then asks SQL). */
export async function searchInMemory(p: SearchParams & { fNumber: number }, weights: Weights, pupil: Pupil, sort: Sort, dir: 'asc' | 'desc', page: number, pageSize: number): Promise<Ordered | null> {
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      return await run(await catalogueCopy(), p, weights, pupil, sort, dir, page, pageSize);
    } catch (e) {
      if (!(e instanceof StaleCopy)) throw e;
      dropCatalogueCopy();
    }
  }
  return null;
}

async function run(s: Snapshot, p: SearchParams & { fNumber: number }, w: Weights, pupil: Pupil, sort: Sort, dir: 'asc' | 'desc', page: number, pageSize: number): Promise<Ordered> {
  const n = s.n;
  const needTau = p.minThroughput !== undefined || sort === 'throughput';
  const namedLine = p.line ? (LINE_IDS as readonly string[]).indexOf(p.line) : -1;

  // The filter table (filters.ts) as tests over the copy: those every facet keeps, once per curve here;
  // the line, method and FWHM ones below, where the facets count without them.
  const tests = activeFilters(p).map((f) => ({ facet: f.facet, test: testOf(f, p, s) }));
  const common = tests.filter((t) => t.facet === null).map((t) => t.test);
  const widthTests = tests.filter((t) => t.facet === 'fwhm').map((t) => t.test);
  const lineAndMethod = tests.filter((t) => t.facet === 'line' || t.facet === 'method').map((t) => t.test);
  const all = (list: ((i: number) => boolean)[], i: number) => {
    for (let k = 0; k < list.length; k++) if (!list[k](i)) return false;
    return true;
  };
  const { aoi, firstLine, instrument, fwhmBucket } = s;
  const mask = new Uint8Array(n);
  // a set's other curves give way to its lead: one row per unit (units.ts)
  const lead = unitLeadsOf(s);
  for (let i = 0; i < n; i++) if (lead[i] && all(common, i)) mask[i] = 1;

  let tau: Float64Array | null = null;
  if (needTau) {
    // the grid rows every candidate needs: the named line, or each curve's first line
    const wanted = new Set<number>();
    if (p.line) wanted.add(namedLine);
    else for (let i = 0; i < n; i++) if (mask[i] && firstLine[i] >= 0) wanted.add(firstLine[i]);
    const blocks: (GridBlock | undefined)[] = [];
    const fines: (FineBlock | undefined)[] = [];
    await Promise.all(
      [...wanted].map(async (li) => {
        blocks[li] = await gridBlock(s, LINE_IDS[li], w.level);
        if (p.nEff !== undefined) fines[li] = await fineBlock(s, LINE_IDS[li]);
      }),
    );
    const { at: termAt, weight } = termsOf(w);
    const terms = termAt.length;
    const canonicalFrame = w.frame === 'canonical-or-direct';
    const fineWidth = FINE_INTERVALS + 1;
    const named = p.nEff;
    const exactNeeded: number[] = [];
    const byAoi = new Map<number, { rows: number; coef: OffNormalCoefficients | null }>();
    const t = (tau = new Float64Array(n).fill(NaN));
    const one = (i: number, li: number, b: GridBlock, row: number) => {
      if (named !== undefined && aoi[i] > 0) {
        // brought to normal incidence with the named n_eff: from the fine level, as search.ts does;
        // a curve targeting the line always has it, else the whole curve goes through the engine
        const f = fines[li]!;
        const r = f.rowOf[i];
        if (r < 0) exactNeeded.push(i);
        else {
          const stored = f.sums.subarray(r * fineWidth, (r + 1) * fineWidth);
          // curves measured at the same AOI share one set of coefficients once there are enough of them
          const seen = byAoi.get(aoi[i]) ?? { rows: 0, coef: null };
          if (!seen.coef && ++seen.rows > SHARED_AOI_ROWS) seen.coef = offNormalCoefficients(aoi[i], named, pupil);
          byAoi.set(aoi[i], seen);
          t[i] = seen.coef ? applyOffNormal(seen.coef, stored) : offNormalThroughput(stored, aoi[i], named, pupil);
        }
        return;
      }
      let arr = b.direct;
      let base = row * LEVEL_LENGTH;
      if (canonicalFrame && b.canonRow[row] >= 0) {
        arr = b.canonical;
        base = b.canonRow[row] * LEVEL_LENGTH;
      }
      let sum = 0;
      for (let k = 0; k < terms; k++) sum += weight[k] * arr[base + termAt[k]];
      t[i] = sum / SCALE;
    };
    if (p.line) {
      // only the curves of that line have grid rows for it
      const b = blocks[namedLine]!;
      for (let row = 0; row < b.members.length; row++) {
        const i = b.members[row];
        if (mask[i]) one(i, namedLine, b, row);
      }
    } else {
      // each curve's first line: block by block, so each loop reads one block
      for (const li of wanted) {
        const b = blocks[li]!;
        for (let row = 0; row < b.members.length; row++) {
          const i = b.members[row];
          if (mask[i] && firstLine[i] === li) one(i, li, b, row);
        }
      }
    }
    if (exactNeeded.length > 0) await exactFromPoints(s, p, pupil, exactNeeded, t);
  }

  // facet groups as in search.ts's facet statement: (line set, FWHM bucket, instrument, FWHM filter holds)
  const counts = new Int32Array(s.lineSets.length * GROUPS_PER_LINE_SET);
  const candidates: number[] = [];
  const minT = p.minThroughput;
  for (let i = 0; i < n; i++) {
    if (!mask[i]) continue;
    if (minT !== undefined && !(tau![i] >= minT)) continue;
    const pf = all(widthTests, i);
    counts[groupKey(s.lineSet[i], fwhmBucket[i], instrument[i], pf)]++;
    if (pf && all(lineAndMethod, i)) candidates.push(i);
  }
  const groups: CountGroup[] = [];
  counts.forEach((count, key) => {
    if (count === 0) return;
    const g = groupOf(key);
    groups.push({ instrument: INSTRUMENTS[g.instrument], bucket: g.bucket === 0 ? null : g.bucket - 1, lines: s.lineSets[g.lineSet], pf: g.pf, n: String(count) });
  });

  const top = firstInOrder(candidates, page * pageSize, comparator(s, sort, dir, tau));
  const shown = top.slice((page - 1) * pageSize, page * pageSize);
  return {
    ids: shown.map((i) => s.ids[i]),
    taus: shown.map((i) => (tau && !Number.isNaN(tau[i]) ? tau[i] : null)),
    groups,
  };
}

/** An off-normal curve without its fine level: the engine on the whole curve, as search.ts does. */
async function exactFromPoints(s: Snapshot, p: SearchParams & { fNumber: number }, pupil: Pupil, rows: number[], tau: Float64Array) {
  const byId = await curvePointsByIds(rows.map((i) => s.ids[i]));
  for (const i of rows) {
    const r = byId.get(s.ids[i]);
    const line = findLine(p.line ?? s.lineSets[s.lineSet[i]][0] ?? '');
    if (!r || !line) continue;
    tau[i] = lineThroughput(r.points, pupil, line.airNm, { nEff: p.nEff!, measuredAoiDeg: s.aoi[i] }).throughput;
  }
}

/** One row of the filter table (filters.ts) as a test of copy row i; NaN (NULL) never passes a comparison, as in SQL. */
function testOf(f: Filter, p: SearchParams, s: Snapshot): (i: number) => boolean {
  switch (f.operator) {
    case '>=': {
      const v = s[f.field];
      const x = p[f.param]!;
      return (i) => v[i] >= x;
    }
    case '<=': {
      const v = s[f.field];
      const x = p[f.param]!;
      return (i) => v[i] <= x;
    }
    case '=': {
      const v = s[f.field];
      const x = f.param === 'method' ? (INSTRUMENTS as readonly string[]).indexOf(p.method!) : s.contributors.indexOf(p.contributor!);
      return (i) => v[i] === x;
    }
    case 'has': {
      const bit = 1 << (LINE_IDS as readonly string[]).indexOf(p.line!);
      const v = s[f.field];
      return (i) => (v[i] & bit) !== 0;
    }
    case 'bucket-in': {
      // the copy keeps 1 + width_bucket, 0 for an unknown FWHM
      const allowed = new Uint8Array(PACKING.bucketSlots);
      for (const key of p.fwhmBucket ?? []) allowed[bucketIndex(key) + 1] = 1;
      const v = s[f.field];
      return (i) => allowed[v[i]] === 1;
    }
  }
}

/** The ORDER BY of search.ts (orderBy) over the copy, from the same sort table; ties by id. */
function comparator(s: Snapshot, sort: Sort, dir: 'asc' | 'desc', tau: Float64Array | null): (a: number, b: number) => number {
  const desc = dir === 'desc';
  // relevance without words is newest first; throughput (and contrast's candidates) put NULL last
  const column = SORT_COLUMNS[sort] ?? (sort === 'relevance' ? SORT_COLUMNS.newest : undefined);
  const vals = column ? s[column.field] : tau!;
  const first = column ? nullsFirst(column.nulls, dir) : false;
  return (a, b) => {
    const x = vals[a];
    const y = vals[b];
    const xn = Number.isNaN(x);
    const yn = Number.isNaN(y);
    if (xn !== yn) return (xn ? 1 : -1) * (first ? -1 : 1);
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
