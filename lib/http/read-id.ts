/**
 * The id rule itself (lib/http/ids.ts explains it), with no server imports so
 * client components can read ids with it too (the compare list).
 */

const MAX_INT4 = 2_147_483_647;

/** A row id, or null when the text is not one. */
export function readId(raw: string): number | null {
  const ok = typeof raw === 'string' && raw.length >= 1 && raw.length <= 10 && [...raw].every((c) => c >= '0' && c <= '9');
  const id = ok ? Number(raw) : NaN;
  return id >= 1 && id <= MAX_INT4 ? id : null;
}
