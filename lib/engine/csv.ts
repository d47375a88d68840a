/**
 * Our own CSV export: `#` metadata lines, then `wavelength_nm,transmission`
 * rows. Text is made formula-safe by the one CSV rule in lib/csv/safe.ts. Numbers are written with String(), the shortest text that reads back to
 * the same double, so the reader returns exactly the points that were written.
 */

import { commentLine } from '@/lib/csv/safe';
import type { CurvePoints } from './types';

export type MetaValue = string | number | undefined | null | string[];

export const CSV_MAGIC = '# bandcone curve';
export const CSV_HEADER = 'wavelength_nm,transmission';

function metaText(v: Exclude<MetaValue, undefined | null>): string {
  if (typeof v === 'number') return String(v);
  if (Array.isArray(v)) return v.map(String).join('; ');
  return v;
}

export function writeCurveCsv(meta: Record<string, MetaValue>, points: CurvePoints): string {
  const out: string[] = [CSV_MAGIC];
  for (const [rawKey, v] of Object.entries(meta)) {
    if (v === undefined || v === null) continue;
    const key = rawKey.replace(/[^A-Za-z0-9_.-]/g, '_');
    // The whole line is judged as a spreadsheet splits it (lib/csv/safe.ts), not only the value.
    out.push(commentLine(`${key}: ${metaText(v)}`));
  }
  out.push(CSV_HEADER);
  const { wavelengthNm: x, transmission: y } = points;
  for (let i = 0; i < x.length; i++) out.push(`${String(x[i])},${String(y[i])}`);
  return out.join('\n') + '\n';
}
