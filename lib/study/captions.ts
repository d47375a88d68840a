/**
 * Words for a chart's caption, read from the series the chart plots, so the
 * caption can never say something the line does not show.
 *
 * The plotted line joins its samples straight, so where it crosses a level is
 * found on that straight segment: for samples (x₀, y₀), (x₁, y₁) on either side
 * of L, the crossing is x = x₀ + (L − y₀)·(x₁ − x₀)/(y₁ − y₀).
 */

import { formatFNumber, formatTransmission } from '@/components/charts/format';

export interface Interval {
  from: number;
  to: number;
}

/**
 * Every stretch of x where the plotted line is at or above `level`, in order of x.
 * `x` must be ascending. A stretch that touches an end of the plotted range
 * starts (or ends) at that end; the others start and end at a crossing.
 */
export function intervalsAtOrAbove(x: readonly number[], y: readonly number[], level: number): Interval[] {
  const out: Interval[] = [];
  const n = Math.min(x.length, y.length);
  let start: number | null = null;
  for (let i = 0; i < n; i++) {
    const above = y[i] >= level;
    if (i === 0) {
      if (above) start = x[0];
      continue;
    }
    const wasAbove = y[i - 1] >= level;
    if (above && !wasAbove) start = crossing(x[i - 1], y[i - 1], x[i], y[i], level);
    if (!above && wasAbove) {
      out.push({ from: start!, to: crossing(x[i - 1], y[i - 1], x[i], y[i], level) });
      start = null;
    }
  }
  if (start !== null && n > 0) out.push({ from: start, to: x[n - 1] });
  return out;
}

function crossing(x0: number, y0: number, x1: number, y1: number, level: number): number {
  return y1 === y0 ? x0 : x0 + ((level - y0) * (x1 - x0)) / (y1 - y0);
}

function joinWords(parts: string[]): string {
  if (parts.length <= 1) return parts.join('');
  return `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`;
}

/**
 * The f-number chart's caption for one curve: where its line keeps `level` of
 * the line, over the f-numbers the chart plots (every stretch, not the first
 * one met from either end).
 */
export function fNumberCaption(x: readonly number[], y: readonly number[], level: number): string {
  const pct = formatTransmission(level, 0);
  if (!x.length) return 'no f-numbers plotted';
  const lo = x[0];
  const hi = x[x.length - 1];
  const span = `${formatFNumber(lo)} to ${formatFNumber(hi)}`;
  const runs = intervalsAtOrAbove(x, y, level);
  if (!runs.length) return `stays below ${pct} of the line everywhere from ${span}`;
  if (runs.length === 1 && runs[0].from === lo && runs[0].to === hi) return `keeps ${pct} of the line at every f-number from ${span}`;
  const stretches = runs.map((r) => (formatFNumber(r.from) === formatFNumber(r.to) ? `at ${formatFNumber(r.from)}` : `from ${formatFNumber(r.from)} to ${formatFNumber(r.to)}`));
  return `keeps ${pct} of the line ${joinWords(stretches)}, and less elsewhere from ${span}`;
}
