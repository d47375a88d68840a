/**
 * Columns: which one holds the wavelength and which the transmission, guessed
 * from the header's hints and from the values of the first rows.
 */

import { MAX_PLAUSIBLE_T } from '../curve';
import type { Layout } from './detect';
import { splitLine } from './fields';
import { type HeaderInfo, isTransmissionHint, isWavelengthHint, transmissionUnitFromHeader } from './header';
import { parseNumber } from './numbers';
import { isSkippable } from './text';
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
): { wc: number; tc: number } {
  const cols: number[][] = Array.from({ length: ncols }, () => []);
  for (let i = dataStart, n = 0; i <= dataEnd && n < SAMPLE_ROWS; i++) {
    if (isSkippable(lines[i])) continue;
    const f = splitLine(lines[i], layout.delimiter);
    for (let c = 0; c < ncols; c++) cols[c].push(c < f.length ? parseNumber(f[c], layout.decimal) : NaN);
    n++;
  }
  const stats = cols.map(columnStats);
  const wlHint = header.text.map(isWavelengthHint);
  const tHint = header.text.map(isTransmissionHint);

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
  return { wc, tc };
}
