/**
 * Light-weight reading of a drawn curve, used for a chart's fallback text summary and
 * its first zoom window. Deliberately simpler than the engine's metrics: it describes
 * what is on screen, it is not the library's number of record.
 */

import { finitePairs } from './downsample';

/** Finite samples in ascending x; uploads are sometimes scanned red-to-blue. */
export function ascending(x: readonly number[], y: readonly number[]): { x: number[]; y: number[] } {
  const p = finitePairs(x, y);
  let sorted = true;
  for (let i = 1; i < p.x.length; i++) {
    if (p.x[i] < p.x[i - 1]) {
      sorted = false;
      break;
    }
  }
  if (sorted) return p;
  const order = p.x.map((_, i) => i).sort((a, b) => p.x[a] - p.x[b]);
  return { x: order.map((i) => p.x[i]), y: order.map((i) => p.y[i]) };
}

/** Linear interpolation at `at`; null outside the sampled range. x must ascend. */
export function valueAt(x: readonly number[], y: readonly number[], at: number): number | null {
  const n = Math.min(x.length, y.length);
  if (n === 0 || at < x[0] || at > x[n - 1]) return null;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= at) lo = mid;
    else hi = mid;
  }
  if (x[hi] === x[lo]) return y[lo];
  const t = (at - x[lo]) / (x[hi] - x[lo]);
  return y[lo] + t * (y[hi] - y[lo]);
}

export interface PassbandStats {
  peak: number;
  peakAt: number;
  /** Half-maximum crossings and their midpoint; null when the curve does not fall to half on both sides. */
  lowerHalf: number | null;
  upperHalf: number | null;
  centre: number | null;
  width: number | null;
}

function crossing(x: readonly number[], y: readonly number[], i: number, j: number, level: number): number {
  const t = (level - y[i]) / (y[j] - y[i]);
  return x[i] + t * (x[j] - x[i]);
}

/** Peak and half-maximum width of the main passband. x must ascend. */
export function passbandStats(x: readonly number[], y: readonly number[]): PassbandStats | null {
  const n = Math.min(x.length, y.length);
  if (n === 0) return null;
  let k = 0;
  for (let i = 1; i < n; i++) if (y[i] > y[k]) k = i;
  const peak = y[k];
  if (!(peak > 0)) return { peak, peakAt: x[k], lowerHalf: null, upperHalf: null, centre: null, width: null };
  const half = peak / 2;
  let lowerHalf: number | null = null;
  for (let i = k; i > 0; i--) {
    if (y[i - 1] < half) {
      lowerHalf = crossing(x, y, i - 1, i, half);
      break;
    }
  }
  let upperHalf: number | null = null;
  for (let i = k; i < n - 1; i++) {
    if (y[i + 1] < half) {
      upperHalf = crossing(x, y, i, i + 1, half);
      break;
    }
  }
  const both = lowerHalf != null && upperHalf != null;
  return {
    peak,
    peakAt: x[k],
    lowerHalf,
    upperHalf,
    centre: both ? (lowerHalf! + upperHalf!) / 2 : null,
    width: both ? upperHalf! - lowerHalf! : null,
  };
}

/**
 * Where the passband sits, padded so its skirts and nearby lines show. Null when the
 * curve fills most of the scan anyway and zooming would hide nothing useful.
 */
export function passbandWindow(
  curves: readonly { x: readonly number[]; y: readonly number[] }[],
  extent: readonly [number, number],
): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of curves) {
    const s = passbandStats(c.x, c.y);
    if (!s || !(s.peak > 0)) continue;
    // Where the curve is above 2 % of its own peak: the passband and its skirts.
    const floor = s.peak * 0.02;
    const k = c.x.indexOf(s.peakAt);
    let a = k;
    while (a > 0 && c.y[a - 1] >= floor) a--;
    let b = k;
    while (b < c.x.length - 1 && c.y[b + 1] >= floor) b++;
    lo = Math.min(lo, c.x[a]);
    hi = Math.max(hi, c.x[b]);
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return null;
  const pad = Math.max((hi - lo) * 0.6, 4);
  const window: [number, number] = [Math.max(extent[0], lo - pad), Math.min(extent[1], hi + pad)];
  const span = extent[1] - extent[0];
  if (span <= 0 || (window[1] - window[0]) / span > 0.6) return null;
  return window;
}
