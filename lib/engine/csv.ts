/**
 * Our own CSV export: `#` metadata lines, then `wavelength_nm,transmission`
 * rows. Numbers are written with String(), the shortest text that reads back to
 * the same double, so the reader returns exactly the points that were written.
 */

import type { CurvePoints } from './types';

export type MetaValue = string | number | undefined | null | string[];

export const CSV_MAGIC = '# bandcone curve';
export const CSV_HEADER = 'wavelength_nm,transmission';

/**
 * Spreadsheets run a cell that starts with = + - @ (or a tab / carriage return
 * that hides one) as a formula; a leading apostrophe makes it plain text.
 */
export function neutraliseCell(s: string): string {
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

function oneLine(s: string): string {
  return s.replace(/\r\n|\r|\n/g, ' ');
}

function metaText(v: Exclude<MetaValue, undefined | null>): string {
  if (typeof v === 'number') return String(v);
  if (Array.isArray(v)) return v.map((s) => neutraliseCell(oneLine(String(s)))).join('; ');
  return neutraliseCell(oneLine(v));
}

export function writeCurveCsv(meta: Record<string, MetaValue>, points: CurvePoints): string {
  const out: string[] = [CSV_MAGIC];
  for (const [rawKey, v] of Object.entries(meta)) {
    if (v === undefined || v === null) continue;
    const key = rawKey.replace(/[^A-Za-z0-9_.-]/g, '_');
    out.push(`# ${key}: ${metaText(v)}`);
  }
  out.push(CSV_HEADER);
  const { wavelengthNm: x, transmission: y } = points;
  for (let i = 0; i < x.length; i++) out.push(`${String(x[i])},${String(y[i])}`);
  return out.join('\n') + '\n';
}
