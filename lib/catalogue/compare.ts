/** The compare board shows at most eight curves (DESIGN.md: never more than 8 series). */
export const MAX_COMPARE = 8;

export function compareHref(ids: readonly number[]): string {
  return ids.length ? `/compare?curves=${ids.join(',')}` : '/compare';
}

/** `curves=1,2,3`: whole numbers in the order given, without repeats, at most MAX_COMPARE. */
export function parseCompareIds(raw: string | string[] | undefined): number[] {
  const text = Array.isArray(raw) ? raw.join(',') : (raw ?? '');
  const ids: number[] = [];
  for (const part of text.split(',')) {
    const t = part.trim();
    const n = Number(t);
    if (/^\d+$/.test(t) && Number.isSafeInteger(n) && n > 0 && n <= 2_147_483_647 && !ids.includes(n)) ids.push(n);
  }
  return ids.slice(0, MAX_COMPARE);
}
