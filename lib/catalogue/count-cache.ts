/**
 * Totals and facet counts of recent searches, kept for a short while. Paging and
 * re-sorting ask for the same counts again, and counting is the one part of a
 * search that must visit every match. Callers put the catalogue version in the
 * key, so a count kept by one process is never served after a verification in
 * another; this process also forgets them at once.
 * Counts taken in the first seconds after a change are not kept: a read replica may not
 * have replayed the change yet (lib/catalogue/read-source.ts).
 */
export const COUNT_TTL_MS = 30_000;
const SETTLE_MS = 2_000;
const MAX_ENTRIES = 500;
let changedAt = -Infinity;

const entries = new Map<string, { at: number; value: Promise<unknown> }>();

export function cachedCounts<T>(key: string, compute: () => Promise<T>): Promise<T> {
  const now = Date.now();
  const hit = entries.get(key);
  if (hit && now - hit.at < COUNT_TTL_MS) {
    // refresh recency so the map behaves as a small LRU
    entries.delete(key);
    entries.set(key, hit);
    return hit.value as Promise<T>;
  }
  const value = compute();
  if (now - changedAt < SETTLE_MS) return value;
  entries.set(key, { at: now, value });
  // a failed count is not remembered
  value.catch(() => entries.delete(key));
  while (entries.size > MAX_ENTRIES) entries.delete(entries.keys().next().value as string);
  return value;
}

/** Called when the public catalogue changes (a curve verified or superseded). */
export function forgetCounts(): void {
  changedAt = Date.now();
  entries.clear();
}
