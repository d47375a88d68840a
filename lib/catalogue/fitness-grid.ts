/**
 * The fitness grid: what a verified curve keeps of a line, stored so that
 * "keeps ≥ 85 % of Hα at f/2.5 with a 0.36 obstruction" is a short weighted
 * sum of stored numbers per curve instead of a cone model per curve.
 *
 * Why this shape. In the cone model (docs/model.md §Angle shift to §Throughput) a ray whose incidence has
 * sin²θ = q sees the measured curve at x = s_m·λ·g, g = 1/sqrt(1 − q/n²); the
 * engine spreads each pupil bin's light evenly in g. So for ANY optic, field
 * angle and n_eff, τ is the mean of T over x = s_m·λ·(1 + r), r ≥ 0, weighted by
 * how the pupil's light falls in r. Storing, per curve and line, the mean of T
 * over short intervals of r (a pyramid of four resolutions) and, per search,
 * the pupil's light in each interval (computed once by the engine from the
 * optic) makes τ a dot product of the two. The curve is stored as running
 * sums of those means, so a run of intervals with one weight costs two array
 * reads; the search merges neighbouring intervals into runs while the error
 * this adds stays under RUN_TOLERANCE. The approximations (T replaced by its
 * interval means, weights by run means) are what the README figure measures.
 *
 * Frames. `direct` holds the curve brought to normal incidence with its default
 * n_eff, from the line redward. A curve whose default n_eff is a fitted value
 * other than DEFAULT_N_EFF also keeps `canonical`: the same response re-indexed
 * so that weights computed at DEFAULT_N_EFF give its response at its own n_eff.
 * A search without n_eff then uses one set of weights for every curve. An
 * off-normal curve also keeps `fine`, for searches that name their own n_eff.
 */

import { angleScale, angleScaleOfSin2, angleScaleSql, DEG } from '@/lib/engine/angles';
import { cumulativeAt, prepareCurve, type PreparedCurve } from '@/lib/engine/curve';
import { findLine } from '@/lib/engine/lines';
import { buildPupil, type Pupil } from '@/lib/engine/pupil';
import type { CurvePoints, Optic } from '@/lib/engine/types';

/** n_eff used when a search names none and the curve has no fitted value (the middle of 1.8–2.3, typical of hard-coated narrowband filters, docs/model.md §Angle shift). */
export const DEFAULT_N_EFF = 2.0;

/** Interval width of each level, as a fraction of the line wavelength (level 0 ≈ 0.066 nm at Hα). */
export const LEVEL_STEPS = [0.0001, 0.0004, 0.0016, 0.0064] as const;
/** Intervals per level; level L spans r ∈ [0, INTERVALS·step_L]. */
export const INTERVALS = 80;
/** Each level stores INTERVALS + 1 running sums (the first is 0). */
export const LEVEL_LENGTH = INTERVALS + 1;
export const GRID_LENGTH = LEVEL_STEPS.length * LEVEL_LENGTH;

/** One level of a frame, as stored (a row of curve_fitness holds one level). */
export function levelOf(arr: Int32Array, level: number): Int32Array {
  return arr.subarray(level * LEVEL_LENGTH, (level + 1) * LEVEL_LENGTH);
}
/** Interval means are stored as round(mean T · SCALE) and summed, so one level is an integer[] slice. */
export const SCALE = 10_000;
/** A search uses the finest level on which the cone covers at most this many intervals. */
export const MAX_TERMS = 64;
/** Off-normal curves also keep one fine level from cos θm times the line (see offNormalThroughput). */
export const FINE_STEP = 0.0002;
export const FINE_INTERVALS = 600;
/** Error budget (in τ, for curves that never exceed T = 1) spent on merging intervals into runs of one weight. */
export const RUN_TOLERANCE = 0.002;

export interface GridInput {
  points: CurvePoints | PreparedCurve;
  /** The angle the curve was measured at; it is brought to normal incidence with its default n_eff. */
  aoiDeg: number;
  /** The curve's fitted n_eff, when it belongs to a measured set. */
  nEff: number | null;
  lines: string[];
}

export interface GridRow {
  lineId: string;
  /** The curve's first line, which a search naming no line targets. */
  primary: boolean;
  nEffDefault: number;
  direct: Int32Array;
  /** Null when the default n_eff is DEFAULT_N_EFF (the direct frame already is canonical). */
  canonical: Int32Array | null;
  /** Off-normal curves only: running sums at FINE_STEP from cos θm times the line. */
  fine: Int32Array | null;
}

export function defaultNEff(fitted: number | null | undefined): number {
  return typeof fitted === 'number' && fitted >= 1 && fitted <= 4 ? fitted : DEFAULT_N_EFF;
}

function quantise(t: number): number {
  const v = Math.round(t * SCALE);
  return v < 0 ? 0 : v > 32767 ? 32767 : v;
}

/** Running sums of the interval means of T, where x(r) maps a stored r to the measured wavelength axis. */
function fill(c: PreparedCurve, x: (r: number) => number, steps: readonly number[] = LEVEL_STEPS, intervals = INTERVALS): Int32Array {
  const out = new Int32Array(steps.length * (intervals + 1));
  steps.forEach((h, L) => {
    let xa = x(0);
    let ca = cumulativeAt(c, xa);
    let sum = 0;
    out[L * (intervals + 1)] = 0;
    for (let j = 0; j < intervals; j++) {
      const xb = x((j + 1) * h);
      const cb = Number.isFinite(xb) ? cumulativeAt(c, xb) : c.total;
      sum += Number.isFinite(xb) && xb > xa ? quantise((cb - ca) / (xb - xa)) : 0;
      out[L * (intervals + 1) + j + 1] = sum;
      xa = xb;
      ca = cb;
    }
  });
  return out;
}

/** The stored rows for one curve: one per catalogued line it targets. */
export function computeFitnessGrid(input: GridInput): GridRow[] {
  const c = prepareCurve(input.points);
  const nDef = defaultNEff(input.nEff);
  const sM = input.aoiDeg > 0 ? angleScale(input.aoiDeg, nDef) : 1;
  const rows: GridRow[] = [];
  for (const lineId of new Set(input.lines)) {
    const line = findLine(lineId);
    if (!line) continue;
    const direct = fill(c, (r) => sM * line.airNm * (1 + r));
    const fineOrigin = Math.cos(input.aoiDeg * DEG) * line.airNm;
    const fine = input.aoiDeg > 0 ? fill(c, (r) => fineOrigin * (1 + r), [FINE_STEP], FINE_INTERVALS) : null;
    let canonical: Int32Array | null = null;
    if (nDef !== DEFAULT_N_EFF) {
      // r at DEFAULT_N_EFF ↔ sin²θ ↔ the wavelength this curve's own n_eff sends that ray to
      const n2 = DEFAULT_N_EFF * DEFAULT_N_EFF;
      const base = sM * line.airNm;
      canonical = fill(c, (r) => {
        const q = n2 * (1 - 1 / ((1 + r) * (1 + r)));
        const a = 1 - q / (nDef * nDef);
        return a > 0 ? base / Math.sqrt(a) : Infinity;
      });
    }
    rows.push({ lineId, primary: lineId === input.lines[0], nEffDefault: nDef, direct, canonical, fine });
  }
  return rows;
}

/**
 * τ of one off-normal curve under a named n_eff. Such a curve is brought to
 * normal incidence by s_m = sqrt(1 − sin²θm/n²), which moves with the n_eff the
 * search names, so its rays land at r = ρ(1 + r_ray) − 1 with ρ = s_m(n)/cos θm
 * on its fine level (which starts at cos θm, s_m at n = 1, so every n_eff from 1
 * to 4 falls on it). ρ differs per curve, so this sum runs here rather than in SQL.
 */
export function offNormalThroughput(stored: ArrayLike<number>, aoiDeg: number, nEff: number, pupil: Pupil, offset = 0): number {
  // `stored` may be a slice of the fine level that starts at running sum number `offset`
  const fine = (j: number) => {
    const v = stored[j - offset];
    if (v === undefined) throw new Error(`fine level read outside its slice (${j})`);
    return v;
  };
  const rho = angleScale(aoiDeg, nEff) / Math.cos(aoiDeg * DEG);
  const inv = 1 / (nEff * nEff);
  const e = pupil.sin2Edges;
  const K = pupil.weights.length;
  const h = FINE_STEP;
  const rOf = (k: number) => rho / angleScaleOfSin2(e[k], inv) - 1;
  // The running sums are the exact integral of T at the interval edges; between edges a
  // cubic Hermite through them, with slopes from the neighbouring means, follows T's
  // changes inside an interval instead of assuming it flat.
  const mean = (j: number) => (j < 0 || j >= FINE_INTERVALS ? 0 : fine(j + 1) - fine(j));
  const cum = (r: number) => {
    const x = r / h;
    if (x <= 0) return 0;
    if (x >= FINE_INTERVALS) return fine(FINE_INTERVALS);
    const j = Math.floor(x);
    const t = x - j;
    const m0 = 0.5 * (mean(j - 1) + mean(j));
    const m1 = 0.5 * (mean(j) + mean(j + 1));
    const d = fine(j + 1) - fine(j);
    const t2 = t * t;
    const t3 = t2 * t;
    return fine(j) + (3 * t2 - 2 * t3) * d + (t3 - 2 * t2 + t) * m0 + (t3 - t2) * m1;
  };
  let tau = 0;
  let ra = rOf(0);
  let ca = cum(ra);
  for (let k = 0; k < K; k++) {
    const rb = rOf(k + 1);
    const cb = cum(rb);
    const w = pupil.weights[k];
    if (w > 0) {
      const dx = (rb - ra) / h;
      if (dx > 1e-9) tau += (w * (cb - ca)) / dx;
      else {
        const j = Math.floor(rb / h);
        if (j >= 0 && j < FINE_INTERVALS) tau += w * (fine(j + 1) - fine(j));
      }
    }
    ra = rb;
    ca = cb;
  }
  return tau / SCALE;
}

/**
 * offNormalThroughput is linear in the stored running sums (no constant term), so
 * for one AOI, n_eff and optic it is a fixed set of coefficients over the slice of
 * the fine level it reads: found by feeding it each unit vector of that slice, and
 * then applied to every curve measured at that AOI as one dot product. Worth it
 * when more curves share the AOI than the slice is wide (AOIs are usually round numbers).
 */
export interface OffNormalCoefficients {
  first: number;
  coef: Float64Array;
}

export function offNormalCoefficients(aoiDeg: number, nEff: number, pupil: Pupil): OffNormalCoefficients {
  const { first, last } = fineSliceBounds(nEff, pupil, aoiDeg);
  const width = Math.max(0, last - first + 1);
  const coef = new Float64Array(width);
  const unit = new Float64Array(width);
  for (let k = 0; k < width; k++) {
    unit[k] = 1;
    coef[k] = offNormalThroughput(unit, aoiDeg, nEff, pupil, first);
    unit[k] = 0;
  }
  return { first, coef };
}

/** offNormalThroughput through its coefficients; `stored` starts at running sum number `offset`. */
export function applyOffNormal(c: OffNormalCoefficients, stored: ArrayLike<number>, offset = 0): number {
  let tau = 0;
  const at = c.first - offset;
  for (let k = 0; k < c.coef.length; k++) tau += c.coef[k] * stored[at + k];
  return tau;
}

/**
 * SQL for the part of a curve's fine level that offNormalThroughput will read for
 * this optic and n_eff: [first, last] running sums, with a margin for the cubic.
 */
export function fineSliceBounds(nEff: number, pupil: Pupil, aoiDeg: number): { first: number; last: number } {
  const inv = 1 / (nEff * nEff);
  const e = pupil.sin2Edges;
  const rho = angleScale(aoiDeg, nEff) / Math.cos(aoiDeg * DEG);
  const g0 = 1 / angleScaleOfSin2(e[0], inv);
  const gK = 1 / angleScaleOfSin2(e[e.length - 1], inv);
  return {
    first: Math.max(0, Math.floor((rho * g0 - 1) / FINE_STEP) - 3),
    last: Math.min(FINE_INTERVALS, Math.ceil((rho * gK - 1) / FINE_STEP) + 3),
  };
}

/** The same bounds as fineSliceBounds, written as SQL over a column holding the AOI. */
export function fineSliceSql(nEff: number, pupil: Pupil, aoiSql: string): { first: string; last: string } {
  const inv = 1 / (nEff * nEff);
  const e = pupil.sin2Edges;
  const g0 = 1 / angleScaleOfSin2(e[0], inv);
  const gK = 1 / angleScaleOfSin2(e[e.length - 1], inv);
  const rho = `(${angleScaleSql(aoiSql, nEff)} / cos(radians(${aoiSql})))`;
  return {
    first: `greatest(0, floor((${rho} * ${g0.toPrecision(15)} - 1) / ${FINE_STEP})::int - 3)`,
    last: `least(${FINE_INTERVALS}, ceil((${rho} * ${gK.toPrecision(15)} - 1) / ${FINE_STEP})::int + 3)`,
  };
}

// ---------------------------------------------------------------- searching

export interface FitnessQuery {
  fNumber: number;
  obstruction: number;
  /** Absent: each curve's default n_eff (its fitted value, else DEFAULT_N_EFF). */
  nEff?: number;
  fieldAngleDeg?: number;
}

/**
 * τ ≈ Σ coefficient · stored[index] / SCALE over one level of one frame (1-based
 * indexes within the level, as SQL arrays count): the weighted interval means,
 * regrouped onto running sums.
 */
export interface Weights {
  frame: 'direct' | 'canonical-or-direct';
  level: number;
  terms: { index: number; weight: number }[];
  /** The pupil's light per interval of the level before merging (for tests). */
  mass: Float64Array;
  /** Light that falls beyond the coarsest level; the stored curve reads 0 there. */
  beyond: number;
  /** Upper bound of the error the merging adds, for curves with T ≤ 1. */
  mergeError: number;
}

interface Run {
  a: number;
  b: number;
  sum: number;
  err: number;
}

function runError(mass: Float64Array, a: number, b: number): number {
  let sum = 0;
  for (let j = a; j < b; j++) sum += mass[j];
  const mean = sum / (b - a);
  let e = 0;
  for (let j = a; j < b; j++) e += Math.abs(mass[j] - mean);
  return e;
}

/** Merges neighbouring intervals, cheapest first, while the total error stays within the budget. */
function mergeRuns(mass: Float64Array, first: number, last: number, budget: number): Run[] {
  let runs: Run[] = [];
  for (let j = first; j <= last; j++) runs.push({ a: j, b: j + 1, sum: mass[j], err: 0 });
  let spent = 0;
  while (runs.length > 1) {
    let best = -1;
    let bestCost = Infinity;
    for (let k = 0; k + 1 < runs.length; k++) {
      const cost = runError(mass, runs[k].a, runs[k + 1].b) - runs[k].err - runs[k + 1].err;
      if (cost < bestCost) {
        bestCost = cost;
        best = k;
      }
    }
    if (spent + bestCost > budget) break;
    const merged = { a: runs[best].a, b: runs[best + 1].b, sum: runs[best].sum + runs[best + 1].sum, err: runs[best].err + runs[best + 1].err + bestCost };
    runs = [...runs.slice(0, best), merged, ...runs.slice(best + 2)];
    spent += bestCost;
  }
  return runs;
}

/** The pupil's light per stored interval, for this optic and n_eff (the engine's pupil, built once per optic). */
export function fitnessWeights(q: FitnessQuery, pupil: Pupil = buildPupil(opticOf(q)), tolerance = RUN_TOLERANCE): Weights {
  const n = q.nEff ?? DEFAULT_N_EFF;
  const inv = 1 / (n * n);
  const e = pupil.sin2Edges;
  const K = pupil.weights.length;
  const r = new Float64Array(K + 1);
  for (let k = 0; k <= K; k++) r[k] = 1 / angleScaleOfSin2(e[k], inv) - 1;
  const lo = r[0];
  const hi = r[K];
  let level = LEVEL_STEPS.length - 1;
  for (let L = 0; L < LEVEL_STEPS.length; L++) {
    const h = LEVEL_STEPS[L];
    const first = Math.floor(lo / h);
    const last = Math.min(INTERVALS - 1, Math.ceil(hi / h) - 1);
    if (hi <= INTERVALS * h && last - first + 1 <= MAX_TERMS) {
      level = L;
      break;
    }
  }
  const h = LEVEL_STEPS[level];
  const span = INTERVALS * h;
  const mass = new Float64Array(INTERVALS);
  let beyond = 0;
  for (let k = 0; k < K; k++) {
    const w = pupil.weights[k];
    if (!(w > 0)) continue;
    const a = r[k];
    const b = r[k + 1];
    if (b - a <= 1e-15) {
      if (a >= span) beyond += w;
      else mass[Math.min(INTERVALS - 1, Math.floor(a / h))] += w;
      continue;
    }
    // the bin's light is even in r between a and b; share it among the intervals it crosses
    if (b > span) beyond += (w * (b - Math.max(a, span))) / (b - a);
    const top = Math.min(b, span);
    for (let j = Math.floor(a / h); j * h < top && j < INTERVALS; j++) {
      const overlap = Math.min(top, (j + 1) * h) - Math.max(a, j * h);
      if (overlap > 0) mass[j] += (w * overlap) / (b - a);
    }
  }
  let first = -1;
  let last = -1;
  for (let j = 0; j < INTERVALS; j++) {
    if (mass[j] > 1e-12) {
      if (first < 0) first = j;
      last = j;
    }
  }
  const terms: Weights['terms'] = [];
  let mergeError = 0;
  if (first >= 0) {
    const runs = mergeRuns(mass, first, last, tolerance);
    // Σ_run mean·(S[b] − S[a]) regrouped per running sum S[k]
    const coef = new Map<number, number>();
    for (const run of runs) {
      const mean = run.sum / (run.b - run.a);
      coef.set(run.b, (coef.get(run.b) ?? 0) + mean);
      coef.set(run.a, (coef.get(run.a) ?? 0) - mean);
      mergeError += run.err;
    }
    for (const [k, c] of [...coef].sort((x, y) => x[0] - y[0])) if (Math.abs(c) > 1e-15) terms.push({ index: k + 1, weight: c });
  }
  return { frame: q.nEff === undefined ? 'canonical-or-direct' : 'direct', level, terms, mass, beyond, mergeError };
}

export function opticOf(q: FitnessQuery): Optic {
  return { fNumber: q.fNumber, obstruction: q.obstruction, fieldAngleDeg: q.fieldAngleDeg ?? 0 };
}

/** What the SQL expression computes, for one stored row (tests and the accuracy figure use it). */
export function interpolate(row: Pick<GridRow, 'direct' | 'canonical'>, w: Weights): number {
  const arr = w.frame === 'canonical-or-direct' ? (row.canonical ?? row.direct) : row.direct;
  let s = 0;
  for (const t of w.terms) s += t.weight * arr[w.level * LEVEL_LENGTH + t.index - 1];
  return s / SCALE;
}

/**
 * The SQL for the interpolated τ, given an expression naming the stored array.
 * Every number in it is computed here from validated input, never copied from
 * the request, so it is safe to inline; float8 constants keep the arithmetic
 * out of numeric.
 */
export function fitnessSql(w: Weights, arr: string): string {
  if (w.terms.length === 0) return '0::float8';
  const parts = w.terms.map((t) => `${t.weight.toPrecision(12)}::float8*${arr}[${t.index}]`);
  return `((${parts.join('+')})/${SCALE}.0)`;
}

/** The stored array a search reads: the canonical frame when the search names no n_eff. */
export function frameSql(w: Weights, alias: string): string {
  return w.frame === 'direct' ? `${alias}.direct` : `(coalesce(${alias}.canonical, ${alias}.direct))`;
}
