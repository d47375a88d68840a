/**
 * Columns: which one holds the wavelength and which the transmission, guessed
 * from the header's hints and from the values of the first rows.
 */

import { MAX_PLAUSIBLE_T } from '../curve';
import type { Layout } from './detect';
import { splitLine } from './fields';
import { type HeaderInfo, isTransmissionHint, isWavelengthHint, transmissionUnitFromHeader } from './header';
import { parseNumber } from './numbers';
import { isBlank, isSkippable } from './text';
import type { ReadOptions } from './types';

const SAMPLE_ROWS = 1000;

interface ColumnStats {
  numeric: boolean;
  monotone: boolean;
  positive: boolean;
  indexLike: boolean;
  min: number;
  max: number;
}

function columnStats(values: number[]): ColumnStats {
  let numeric = values.length > 0;
  let up = true;
  let down = true;
  let positive = true;
  let indexLike = values.length > 1;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isNaN(v)) {
      numeric = false;
      continue;
    }
    if (v <= 0) positive = false;
    if (v < min) min = v;
    if (v > max) max = v;
    if (i > 0) {
      if (v < values[i - 1]) up = false;
      if (v > values[i - 1]) down = false;
      if (v - values[i - 1] !== 1) indexLike = false;
    }
  }
  if (!Number.isInteger(values[0])) indexLike = false;
  return { numeric, monotone: (up || down) && max > min, positive, indexLike, min, max };
}

export function chooseColumns(
  lines: string[],
  dataStart: number,
  dataEnd: number,
  layout: Layout,
  ncols: number,
  header: HeaderInfo,
  options: ReadOptions,
): ColumnChoice {
  const cols: number[][] = Array.from({ length: ncols }, () => []);
  // the same values without blank fields: a shorter scan in a pair of columns is padded with blanks
  const filled: number[][] = Array.from({ length: ncols }, () => []);
  for (let i = dataStart, n = 0; i <= dataEnd && n < SAMPLE_ROWS; i++) {
    if (isSkippable(lines[i])) continue;
    const f = splitLine(lines[i], layout.delimiter);
    for (let c = 0; c < ncols; c++) {
      const v = c < f.length ? parseNumber(f[c], layout.decimal) : NaN;
      cols[c].push(v);
      if (c < f.length && !isBlank(f[c])) filled[c].push(v);
    }
    n++;
  }
  const stats = cols.map(columnStats);
  const wlHint = header.text.map(isWavelengthHint);
  const tHint = header.text.map(isTransmissionHint);

  const pairs = countPairs(filled.map(columnStats), wlHint, tHint, header.text);
  const pairAngles = Array.from({ length: pairs }, (_, k) => angleFromHeader(header.text[2 * k + 1]) ?? angleFromHeader(header.text[2 * k]));
  if (options.pair !== undefined && options.wavelengthColumn === undefined && options.transmissionColumn === undefined) {
    return { wc: 2 * (options.pair - 1), tc: 2 * (options.pair - 1) + 1, pairs, pair: options.pair, pairAngles };
  }
  if (pairs >= 2 && options.wavelengthColumn === undefined && options.transmissionColumn === undefined) {
    return { wc: 0, tc: 1, pairs, pair: 1, pairAngles };
  }

  let wc = options.wavelengthColumn ?? -1;
  if (wc < 0) {
    const ok = (c: number) => stats[c].numeric && stats[c].monotone && stats[c].positive;
    const order = [...Array(ncols).keys()];
    const hinted = order.find((c) => ok(c) && wlHint[c] && !tHint[c]);
    wc = hinted ?? order.find((c) => ok(c) && !stats[c].indexLike) ?? order.find((c) => ok(c)) ?? order.find((c) => stats[c].numeric) ?? 0;
    // a short unsorted file can make a fraction column look monotone; an earlier
    // column of wavelength-sized values is the better guess then
    if (hinted === undefined && stats[wc].max <= MAX_PLAUSIBLE_T) {
      const earlier = order.find((c) => c < wc && stats[c].numeric && stats[c].positive && !stats[c].indexLike && stats[c].max > MAX_PLAUSIBLE_T);
      if (earlier !== undefined) wc = earlier;
    }
  }
  let tc = options.transmissionColumn ?? -1;
  if (tc < 0) {
    const plausible = (c: number) =>
      c !== wc && stats[c].numeric && (transmissionUnitFromHeader(header.text[c]) === 'od' || (stats[c].min >= -0.5 && stats[c].max <= 150));
    const order = [...Array(ncols).keys()];
    const after = order.filter((c) => c > wc).concat(order.filter((c) => c < wc));
    tc =
      after.find((c) => plausible(c) && tHint[c] && !wlHint[c]) ??
      after.find((c) => plausible(c) && !stats[c].indexLike) ??
      after.find((c) => plausible(c)) ??
      after.find((c) => stats[c].numeric) ??
      after[0];
  }
  return { wc, tc, pairs, pair: pairs >= 2 && wc % 2 === 0 && tc === wc + 1 ? wc / 2 + 1 : 0, pairAngles };
}

export interface ColumnChoice {
  wc: number;
  tc: number;
  /** Pairs of (wavelength, transmission) columns side by side, one per angle; 0 when the file is not laid out so. */
  pairs: number;
  /** The pair read, 1-based (0 when not reading a pair). */
  pair: number;
  /** Angle of incidence of each pair, in degrees, when the header names it. */
  pairAngles: (number | null)[];
}

/**
 * Several scans side by side: an even number of columns (4 or more) that
 * alternate wavelength (increasing or decreasing, positive, wavelength-sized
 * or named so) and transmission (plausible values or named so).
 */
function countPairs(stats: ColumnStats[], wlHint: boolean[], tHint: boolean[], text: string[]): number {
  const n = stats.length;
  if (n < 4 || n % 2 !== 0) return 0;
  for (let c = 0; c < n; c += 2) {
    const w = stats[c];
    const t = stats[c + 1];
    const wl = w.numeric && w.monotone && w.positive && !w.indexLike && (w.max > MAX_PLAUSIBLE_T || (wlHint[c] && !tHint[c]));
    const tr = t.numeric && ((t.min >= -0.5 && t.max <= 150) || transmissionUnitFromHeader(text[c + 1]) === 'od') && !(wlHint[c + 1] && !tHint[c + 1]);
    if (!wl || !tr) return 0;
  }
  return n / 2;
}

/**
 * The angle a header names: a number followed by "°" or "deg", or following
 * "aoi", "angle", "theta" or "θ" (then "=", ":", "@" or spaces). Scanned by hand.
 */
export function angleFromHeader(h: string): number | null {
  const numberBefore = (end: number): number | null => {
    let j = end;
    while (j > 0 && h[j - 1] === ' ') j--;
    let k = j;
    while (k > 0 && ((h.charCodeAt(k - 1) >= 48 && h.charCodeAt(k - 1) <= 57) || h[k - 1] === '.')) k--;
    if (k === j) return null;
    const v = parseNumber(h.slice(k, j), '.');
    return Number.isFinite(v) && v >= 0 && v <= 90 ? v : null;
  };
  const numberAfter = (start: number): number | null => {
    let j = start;
    while (j < h.length && (h[j] === ' ' || h[j] === '=' || h[j] === ':' || h[j] === '@' || h[j] === '_' || h[j] === '-')) j++;
    let k = j;
    while (k < h.length && ((h.charCodeAt(k) >= 48 && h.charCodeAt(k) <= 57) || h[k] === '.')) k++;
    if (k === j) return null;
    const v = parseNumber(h.slice(j, k), '.');
    return Number.isFinite(v) && v >= 0 && v <= 90 ? v : null;
  };
  for (const mark of ['°', 'deg']) {
    for (let at = h.indexOf(mark); at >= 0; at = h.indexOf(mark, at + 1)) {
      const v = numberBefore(at);
      if (v !== null) return v;
    }
  }
  for (const word of ['aoi', 'angle', 'theta', 'θ']) {
    for (let at = h.indexOf(word); at >= 0; at = h.indexOf(word, at + 1)) {
      const v = numberAfter(at + word.length);
      if (v !== null) return v;
    }
  }
  return null;
}
