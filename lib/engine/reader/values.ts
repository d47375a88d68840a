/**
 * From raw readings to a clean curve: each value converted to nm and to a
 * transmission fraction (T = 10^−OD for optical density) and checked, then
 * sorted with exact repeats merged. Shared by the table reader and the
 * JCAMP-DX reader; every refusal names the line the value came from.
 */

import { MAX_PLAUSIBLE_T, MIN_POINTS, NEGATIVE_NOISE_FLOOR, sortAndCollapse } from '../curve';
import type { LineDetail } from '../errors';
import type { CurvePoints } from '../types';
import { MAX_DETAILS, fail } from './text';
import type { TransmissionUnit, WavelengthUnit } from './types';

/** Plain array from a typed one (a loop is several times faster than Array.from here). */
function toArray(a: Float64Array): number[] {
  const out = new Array<number>(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  return out;
}

export function checkedPoints(
  wlRaw: Float64Array,
  tRaw: Float64Array,
  lineNo: Int32Array,
  n: number,
  wavelengthUnit: WavelengthUnit,
  transmissionUnit: TransmissionUnit,
  fallbackLine: number,
  warnings: string[],
): CurvePoints {
  const errors: LineDetail[] = [];
  // convert and check values
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  let clamped = 0;
  const tLabel = (v: number) => (transmissionUnit === 'percent' ? `${v} %` : transmissionUnit === 'od' ? `OD ${v}` : `${v}`);
  for (let i = 0; i < n; i++) {
    // dividing by 10 keeps Å values that are exact decimals at the nearest double
    const w = wavelengthUnit === 'angstrom' ? wlRaw[i] / 10 : wavelengthUnit === 'um' ? wlRaw[i] * 1000 : wlRaw[i];
    if (!(w > 0) || !Number.isFinite(w)) {
      errors.push({ line: lineNo[i], message: `wavelength ${wlRaw[i]} is not a positive finite number` });
    }
    const r = tRaw[i];
    let t = transmissionUnit === 'percent' ? r / 100 : transmissionUnit === 'od' ? 10 ** -r : r;
    if (!Number.isFinite(t)) {
      errors.push({ line: lineNo[i], message: `transmission ${tLabel(r)} is not a finite number` });
    } else if (t < NEGATIVE_NOISE_FLOOR) {
      errors.push({ line: lineNo[i], message: `transmission ${tLabel(r)} is negative beyond instrument noise` });
    } else if (t > MAX_PLAUSIBLE_T) {
      errors.push({ line: lineNo[i], message: `transmission ${tLabel(r)} is above 150 %, which is not a plausible reading` });
    } else if (t < 0) {
      t = 0;
      clamped++;
    }
    x[i] = w;
    y[i] = t;
    if (errors.length >= MAX_DETAILS) break;
  }
  if (errors.length > 0) fail(errors);
  if (clamped > 0) warnings.push(`${clamped} slightly negative transmission value(s), within instrument noise, were set to 0.`);

  const c = sortAndCollapse(x, y, lineNo);
  if (c.conflicts.length > 0) {
    fail(
      c.conflicts.slice(0, MAX_DETAILS).map(([a, b]) => ({
        line: b,
        message: `wavelength repeats line ${a} with a different transmission (lines ${a} and ${b})`,
      })),
    );
  }
  if (c.reordered === 'descending') warnings.push('Wavelengths were descending and have been put in ascending order.');
  if (c.reordered === 'sorted') warnings.push('Wavelengths were out of order and have been sorted.');
  if (c.collapsed > 0) warnings.push(`${c.collapsed} exactly repeated row(s) were merged.`);
  if (c.x.length < MIN_POINTS) {
    fail([{ line: lineNo[n - 1] ?? fallbackLine, message: `only ${c.x.length} distinct wavelength(s); a curve needs at least ${MIN_POINTS}` }]);
  }

  return { wavelengthNm: toArray(c.x), transmission: toArray(c.y) };
}
