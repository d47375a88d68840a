/**
 * The passband thumbnail a result row carries: the part of the curve where the
 * filter passes light (plus a margin), cut to at most 60 points. A 3 nm
 * passband in a 400–800 nm scan would otherwise be a single spike.
 */

import { downsampleLttb } from '@/components/charts/downsample';
import type { CurvePoints } from '@/lib/engine/types';

export const SPARKLINE_POINTS = 60;

export function sparklineOf(points: CurvePoints, fwhmNm: number | null, target = SPARKLINE_POINTS): CurvePoints {
  const x = points.wavelengthNm;
  const y = points.transmission;
  const n = Math.min(x.length, y.length);
  if (n === 0) return { wavelengthNm: [], transmission: [] };
  let peak = 0;
  for (let i = 0; i < n; i++) if (y[i] > peak) peak = y[i];
  // where the curve passes a tenth of its peak, widened by a passband either side
  let first = 0;
  let last = n - 1;
  if (peak > 0) {
    while (first < n - 1 && y[first] < peak / 10) first++;
    while (last > 0 && y[last] < peak / 10) last--;
  }
  const margin = Math.max(2, 1.5 * (fwhmNm ?? (x[last] - x[first] || 2)));
  const lo = x[first] - margin;
  const hi = x[last] + margin;
  let a = first;
  while (a > 0 && x[a - 1] >= lo) a--;
  let b = last;
  while (b < n - 1 && x[b + 1] <= hi) b++;
  const cut = downsampleLttb(x.slice(a, b + 1), y.slice(a, b + 1), target);
  const round = (v: number, d: number) => Number(v.toFixed(d));
  return { wavelengthNm: cut.x.map((v) => round(v, 3)), transmission: cut.y.map((v) => round(v, 4)) };
}
