/**
 * A fitness search over the public catalogue answered from the in-process copy
 * (memory-index.ts): the same filters, facet groups and order as the SQL in
 * search.ts, with τ summed over typed arrays. search.ts uses it for searches
 * without words whose readers see verified curves only; everything else runs
 * in SQL. tests/integration/catalogue-memory.test.ts holds the two answers equal.
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { lineThroughput } from '@/lib/engine/cone';
import { findLine } from '@/lib/engine/lines';
import type { Pupil } from '@/lib/engine/pupil';
import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';
import { FINE_INTERVALS, LEVEL_LENGTH, SCALE, applyOffNormal, offNormalCoefficients, offNormalThroughput, type OffNormalCoefficients, type Weights } from './fitness-grid';
import { curvePointsByIds } from './points';
import { catalogueCopy, dropCatalogueCopy, fineBlock, gridBlock, StaleCopy, unitLeadsOf, type FineBlock, type GridBlock, type Snapshot } from './memory-index';
import { hasFitness, type SearchParams, type Sort } from './search-params';

export type CountGroup = { instrument: string; bucket: number | null; lines: string[]; pf: boolean; n: string };

/**
 * Searches the copy can answer: an optic, no words, and a reader who sees verified curves only,
 * which is every visitor, anyone asking for status=verified, and a contributor with no curve of
 * their own awaiting a decision or turned down (their search would show those too, search.ts).
 */
export async function answeredInMemory(actor: Actor | null, p: SearchParams): Promise<boolean> {
  if (!hasFitness(p) || p.q) return false;
  if (p.status === 'verified') return true;
  if (!actor) return p.status === undefined;
  if (hasRole(actor, 'moderator') || p.status !== undefined) return false;
  const own = await db().sequelize.query(
    `SELECT 1 FROM curves WHERE contributor_id = $1::uuid AND status IN ('submitted', 'changes_requested', 'rejected') LIMIT 1`,
    { bind: [actor.id], type: QueryTypes.SELECT },
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
  const method = p.method ? (INSTRUMENTS as readonly string[]).indexOf(p.method) : -1;

  // The filters every facet keeps, once per curve. Written out flat over local typed arrays:
  // this loop and the two below run over 100 000 curves per search.
  const { fwhm, peak, aoi, contributor, firstLine, lineMask, instrument, fwhmBucket } = s;
  // the CWL of the filter is at normal incidence, and a set's other curves give way to its lead (units.ts)
  const cwl = s.normalCwl;
  const lead = unitLeadsOf(s);
  const who = p.contributor ? s.contributors.indexOf(p.contributor) : -2;
  const [cwlLo, cwlHi, peakLo, aoiLo, aoiHi] = [p.cwlMin, p.cwlMax, p.peakMin, p.aoiMin, p.aoiMax];
  const mask = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    if (!lead[i]) continue;
    if (cwlLo !== undefined && !(cwl[i] >= cwlLo)) continue;
    if (cwlHi !== undefined && !(cwl[i] <= cwlHi)) continue;
    if (peakLo !== undefined && !(peak[i] >= peakLo)) continue;
    if (aoiLo !== undefined && !(aoi[i] >= aoiLo)) continue;
    if (aoiHi !== undefined && !(aoi[i] <= aoiHi)) continue;
    if (who !== -2 && contributor[i] !== who) continue;
    mask[i] = 1;
  }

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
  const counts = new Int32Array(s.lineSets.length * 256);
  const candidates: number[] = [];
  const [fLo, fHi, minT] = [p.fwhmMin, p.fwhmMax, p.minThroughput];
  const lineBit = namedLine >= 0 ? 1 << namedLine : 0;
  for (let i = 0; i < n; i++) {
    if (!mask[i]) continue;
    if (minT !== undefined && !(tau![i] >= minT)) continue;
    const pf = (fLo === undefined || fwhm[i] >= fLo) && (fHi === undefined || fwhm[i] <= fHi);
    counts[((s.lineSet[i] * 16 + fwhmBucket[i]) * 8 + instrument[i]) * 2 + (pf ? 1 : 0)]++;
    if (pf && (lineBit === 0 || (lineMask[i] & lineBit) !== 0) && (method < 0 || instrument[i] === method)) candidates.push(i);
  }
  const groups: CountGroup[] = [];
  counts.forEach((count, key) => {
    if (count === 0) return;
    const bucket = Math.floor(key / 16) % 16;
    groups.push({ instrument: INSTRUMENTS[Math.floor(key / 2) % 8], bucket: bucket === 0 ? null : bucket - 1, lines: s.lineSets[Math.floor(key / 256)], pf: key % 2 === 1, n: String(count) });
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

/** The ORDER BY of search.ts (orderBy) over the copy: NULLs last except the oldest-first order, ties by id. */
function comparator(s: Snapshot, sort: Sort, dir: 'asc' | 'desc', tau: Float64Array | null): (a: number, b: number) => number {
  const desc = dir === 'desc';
  let vals: Float64Array;
  let nullsFirst = false;
  switch (sort) {
    case 'cwl':
      vals = s.normalCwl;
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
