/**
 * A measured curve as the model uses it: sorted typed arrays, linear
 * interpolation between samples, zero outside the measured range (docs/model.md §Curve),
 * plus the running integral so the mean of T over any interval is exact.
 */

import { EngineInputError, type InputDetail } from './errors';
import type { CurvePoints } from './types';

export interface PreparedCurve {
  readonly kind: 'prepared-curve';
  readonly n: number;
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** slope[j] = (y[j+1] − y[j]) / (x[j+1] − x[j]) */
  readonly slope: Float64Array;
  /** cum[j] = ∫ T dλ from x[0] to x[j] (trapezoid, exact for the linear interpolant). */
  readonly cum: Float64Array;
  /** mom[j] = ∫ (λ − x[0])·T dλ from x[0] to x[j], exact for the linear interpolant. */
  readonly mom: Float64Array;
  readonly xMin: number;
  readonly xMax: number;
  readonly peak: number;
  readonly peakIndex: number;
  readonly total: number;
}

export const MIN_POINTS = 5;
/** Readings this far below zero are instrument noise and are clamped, not refused. */
export const NEGATIVE_NOISE_FLOOR = -0.005;
/** A fraction above this is not a plausible transmission after unit conversion. */
export const MAX_PLAUSIBLE_T = 1.5;

export interface CollapseResult {
  x: Float64Array;
  y: Float64Array;
  /** Tag (index or line number) of each kept sample. */
  tags: Float64Array;
  collapsed: number;
  reordered: 'ascending' | 'descending' | 'sorted';
  /** Pairs of tags that share a wavelength but disagree on the value. */
  conflicts: [number, number][];
}

/**
 * Sorts by wavelength and merges exact repeats. Descending input (common from
 * scanning monochromators) is reversed in O(n) rather than sorted.
 */
export function sortAndCollapse(xIn: ArrayLike<number>, yIn: ArrayLike<number>, tagIn: ArrayLike<number>): CollapseResult {
  const n = xIn.length;
  let asc = true;
  let desc = true;
  for (let i = 1; i < n && (asc || desc); i++) {
    if (xIn[i] < xIn[i - 1]) asc = false;
    if (xIn[i] > xIn[i - 1]) desc = false;
  }
  let order: Uint32Array;
  let reordered: CollapseResult['reordered'];
  if (asc) {
    order = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    reordered = 'ascending';
  } else if (desc) {
    order = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = n - 1 - i;
    reordered = 'descending';
  } else {
    order = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    // stable on ties so a conflict names the lines in file order
    order.sort((a, b) => xIn[a] - xIn[b] || a - b);
    reordered = 'sorted';
  }
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const tags = new Float64Array(n);
  const conflicts: [number, number][] = [];
  let m = 0;
  let collapsed = 0;
  for (let k = 0; k < n; k++) {
    const i = order[k];
    if (m > 0 && xIn[i] === x[m - 1]) {
      if (yIn[i] === y[m - 1]) collapsed++;
      else conflicts.push([Math.min(tags[m - 1], tagIn[i]), Math.max(tags[m - 1], tagIn[i])]);
      continue;
    }
    x[m] = xIn[i];
    y[m] = yIn[i];
    tags[m] = tagIn[i];
    m++;
  }
  return { x: x.subarray(0, m), y: y.subarray(0, m), tags: tags.subarray(0, m), collapsed, reordered, conflicts };
}

/**
 * Validates points that arrive as JSON (not through the file reader) with the
 * same rules as a file, and returns them sorted and collapsed.
 */
export function cleanPoints(points: CurvePoints): { points: CurvePoints; warnings: string[] } {
  const details: InputDetail[] = [];
  const wl = points?.wavelengthNm;
  const tr = points?.transmission;
  if (!Array.isArray(wl) || !Array.isArray(tr)) {
    throw new EngineInputError('Points need "wavelengthNm" and "transmission" arrays.', [
      { field: 'points', message: 'expected { wavelengthNm: number[], transmission: number[] }' },
    ]);
  }
  if (wl.length !== tr.length) {
    throw new EngineInputError(
      `The wavelength and transmission arrays differ in length (${wl.length} and ${tr.length}).`,
      [{ field: 'points', message: 'arrays must be the same length' }],
    );
  }
  const n = wl.length;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const tags = new Float64Array(n);
  let clamped = 0;
  for (let i = 0; i < n; i++) {
    const w = wl[i];
    let t = tr[i];
    if (typeof w !== 'number' || !Number.isFinite(w) || w <= 0) {
      details.push({ field: 'wavelengthNm', index: i, message: `wavelength ${String(w)} is not a positive finite number` });
    }
    if (typeof t !== 'number' || !Number.isFinite(t)) {
      details.push({ field: 'transmission', index: i, message: `transmission ${String(t)} is not a finite number` });
    } else if (t < NEGATIVE_NOISE_FLOOR) {
      details.push({ field: 'transmission', index: i, message: `transmission ${t} is negative beyond noise (below ${NEGATIVE_NOISE_FLOOR})` });
    } else if (t > MAX_PLAUSIBLE_T) {
      details.push({ field: 'transmission', index: i, message: `transmission ${t} is above ${MAX_PLAUSIBLE_T}; send fractions 0–1, not percent` });
    } else if (t < 0) {
      t = 0;
      clamped++;
    }
    x[i] = w;
    y[i] = t;
    tags[i] = i;
    if (details.length >= 50) break;
  }
  if (details.length > 0) {
    throw new EngineInputError(
      `Point ${details[0].index}: ${details[0].message}${details.length > 1 ? ` (and ${details.length - 1} more problems)` : ''}.`,
      details,
    );
  }
  const c = sortAndCollapse(x, y, tags);
  if (c.conflicts.length > 0) {
    const [a, b] = c.conflicts[0];
    throw new EngineInputError(
      `Points ${a} and ${b} repeat wavelength ${wl[a]} nm with different transmissions.`,
      c.conflicts.slice(0, 50).map(([p, q]) => ({ field: 'wavelengthNm', index: q, message: `repeats the wavelength of point ${p} with a different value` })),
    );
  }
  if (c.x.length < MIN_POINTS) {
    throw new EngineInputError(`A curve needs at least ${MIN_POINTS} distinct wavelengths; got ${c.x.length}.`, [
      { field: 'points', message: `only ${c.x.length} distinct wavelengths` },
    ]);
  }
  const warnings: string[] = [];
  if (clamped > 0) warnings.push(`${clamped} slightly negative transmission value(s) (noise) were set to 0.`);
  if (c.collapsed > 0) warnings.push(`${c.collapsed} exactly repeated sample(s) were merged.`);
  return { points: { wavelengthNm: Array.from(c.x), transmission: Array.from(c.y) }, warnings };
}

/** ∫₀^d (e + u)(y + m·u) du: the first moment of one linear segment about x[0], e = x_j − x[0]. */
export function segmentMoment(e: number, y: number, m: number, d: number): number {
  return d * (e * y + d * ((e * m + y) / 2 + (m * d) / 3));
}

/**
 * Builds the typed-array form from points that are already clean (sorted,
 * strictly increasing, finite). Use `prepareCurve` for anything from outside.
 */
export function prepareCleanCurve(x: Float64Array, y: Float64Array): PreparedCurve {
  const n = x.length;
  const slope = new Float64Array(Math.max(n - 1, 0));
  const cum = new Float64Array(n);
  const mom = new Float64Array(n);
  let peak = -Infinity;
  let peakIndex = 0;
  for (let j = 0; j < n; j++) {
    if (y[j] > peak) {
      peak = y[j];
      peakIndex = j;
    }
    if (j < n - 1) {
      const dx = x[j + 1] - x[j];
      slope[j] = (y[j + 1] - y[j]) / dx;
      cum[j + 1] = cum[j] + 0.5 * dx * (y[j] + y[j + 1]);
      mom[j + 1] = mom[j] + segmentMoment(x[j] - x[0], y[j], slope[j], dx);
    }
  }
  return {
    kind: 'prepared-curve',
    n,
    x,
    y,
    slope,
    cum,
    mom,
    xMin: x[0],
    xMax: x[n - 1],
    peak,
    peakIndex,
    total: cum[n - 1],
  };
}

export function isPrepared(c: CurvePoints | PreparedCurve): c is PreparedCurve {
  return (c as PreparedCurve).kind === 'prepared-curve';
}

/** Validates and prepares; a prepared curve passes through untouched. */
export function prepareCurve(c: CurvePoints | PreparedCurve): PreparedCurve {
  if (isPrepared(c)) return c;
  const { points } = cleanPoints(c);
  return prepareCleanCurve(Float64Array.from(points.wavelengthNm), Float64Array.from(points.transmission));
}

/** Index j with x[j] ≤ v < x[j+1], clamped to [0, n−2]. */
export function locate(x: Float64Array, v: number): number {
  let lo = 0;
  let hi = x.length - 1;
  if (v <= x[0]) return 0;
  if (v >= x[hi]) return hi - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (x[mid] <= v) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** T at λ by linear interpolation; 0 outside the measured range. */
export function interpolate(c: PreparedCurve, v: number): number {
  if (!(v >= c.xMin && v <= c.xMax)) return 0;
  const j = locate(c.x, v);
  return c.y[j] + c.slope[j] * (v - c.x[j]);
}

export function isCovered(c: PreparedCurve, v: number): boolean {
  return v >= c.xMin && v <= c.xMax;
}

/** Samples at arbitrary wavelengths (binary search each). */
export function sampleAt(c: PreparedCurve, xs: ArrayLike<number>): Float64Array {
  const out = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) out[i] = interpolate(c, xs[i]);
  return out;
}

/** Samples at ascending wavelengths in one forward sweep, O(n + m). */
export function sampleSorted(c: PreparedCurve, xs: ArrayLike<number>): Float64Array {
  const out = new Float64Array(xs.length);
  const { x, y, slope, n } = c;
  let j = 0;
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i];
    if (!(v >= c.xMin && v <= c.xMax)) {
      out[i] = 0;
      continue;
    }
    while (j < n - 2 && x[j + 1] <= v) j++;
    out[i] = y[j] + slope[j] * (v - x[j]);
  }
  return out;
}

/** ∫ T dλ from the start of the measured range to v (constant beyond the ends). */
export function cumulativeAt(c: PreparedCurve, v: number): number {
  if (v <= c.xMin) return 0;
  if (v >= c.xMax) return c.total;
  const j = locate(c.x, v);
  const d = v - c.x[j];
  return c.cum[j] + d * (c.y[j] + 0.5 * c.slope[j] * d);
}

/** Mean of T over [a, b], exact for the linear interpolant (zero outside the range). */
export function meanOver(c: PreparedCurve, a: number, b: number): number {
  if (b < a) [a, b] = [b, a];
  if (b - a < 1e-12 * Math.max(1, Math.abs(a))) return interpolate(c, 0.5 * (a + b));
  return (cumulativeAt(c, b) - cumulativeAt(c, a)) / (b - a);
}

export function toPoints(c: PreparedCurve): CurvePoints {
  return { wavelengthNm: Array.from(c.x), transmission: Array.from(c.y) };
}
