import { readId } from '@/lib/http/read-id';
import { parseSearchParams } from './search-params';

/** The compare board shows at most eight curves (docs/design.md §Charts: never more than 8 series). */
export const MAX_COMPARE = 8;

/** The optic a catalogue search used, carried to the compare board so its throughputs are for the same optic. */
export interface CompareOptic {
  fNumber: number;
  obstruction: number;
  fieldAngleDeg?: number;
  nEff?: number;
}

export function compareHref(ids: readonly number[], optic?: CompareOptic | null): string {
  const u = new URLSearchParams();
  if (ids.length) u.set('curves', ids.join(','));
  if (optic) {
    u.set('fNumber', String(optic.fNumber));
    u.set('obstruction', String(optic.obstruction));
    if (optic.fieldAngleDeg) u.set('fieldAngleDeg', String(optic.fieldAngleDeg));
    if (optic.nEff !== undefined) u.set('nEff', String(optic.nEff));
  }
  const q = u.toString().replace(/%2C/g, ',');
  return q ? `/compare?${q}` : '/compare';
}

/** The optic in a compare board's address, checked by the catalogue's own rules; none when absent or out of range. */
export function parseCompareOptic(raw: Record<string, string | string[] | undefined>): CompareOptic | null {
  const one = (k: string) => (Array.isArray(raw[k]) ? raw[k][0] : raw[k]);
  if (!one('fNumber')) return null;
  try {
    const p = parseSearchParams({ fNumber: one('fNumber'), obstruction: one('obstruction'), fieldAngleDeg: one('fieldAngleDeg'), nEff: one('nEff') });
    return { fNumber: p.fNumber!, obstruction: p.obstruction ?? 0, fieldAngleDeg: p.fieldAngleDeg ?? 0, ...(p.nEff !== undefined ? { nEff: p.nEff } : {}) };
  } catch {
    return null;
  }
}

/** `curves=1,2,3`: whole numbers in the order given, without repeats, at most MAX_COMPARE. */
export function parseCompareIds(raw: string | string[] | undefined): number[] {
  const text = Array.isArray(raw) ? raw.join(',') : (raw ?? '');
  const ids: number[] = [];
  for (const part of text.split(',')) {
    const n = readId(part.trim());
    if (n !== null && !ids.includes(n)) ids.push(n);
  }
  return ids.slice(0, MAX_COMPARE);
}
