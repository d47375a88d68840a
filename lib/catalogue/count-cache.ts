/**
 * Answers about the public catalogue kept for a short while: the totals and facet
 * counts of recent searches (paging and re-sorting ask for the same counts again, and
 * counting is the one part of a search that must visit every match), and whole
 * answers to signed-out visitors' searches (the same few searches are asked again and
 * again). Callers put the catalogue version in the key, so an answer kept by one
 * process is never served after a verification in another; this process also forgets
 * them at once. Answers taken in the first seconds after a change are not kept: a read
 * replica may not have replayed the change yet (lib/catalogue/read-source.ts).
 */
export const COUNT_TTL_MS = 30_000;
const SETTLE_MS = 2_000;
let changedAt = -Infinity;

type Entry = { at: number; value: Promise<unknown> };

/** A small LRU of promised values under version-bearing keys, `maxEntries` long. */
function keeper(maxEntries: number) {
  const entries = new Map<string, Entry>();
  const keep = <T>(key: string, compute: () => Promise<T>): Promise<T> => {
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
    // a failure is not remembered
    value.catch(() => entries.delete(key));
    while (entries.size > maxEntries) entries.delete(entries.keys().next().value as string);
    return value;
  };
  return { keep, entries };
}

// A count is a few dozen small groups; an answer is a page of rows with their sparklines
// (about 30 kB as JSON), so fewer answers are kept: 200 of them stay near 10 MB.
const counts = keeper(500);
const answers = keeper(200);

export const cachedCounts = counts.keep;

/**
 * A signed-out visitor's whole answer. The value is frozen, so one caller cannot change what
 * the next is given.
 */
export function cachedAnswer<T extends object>(key: string, compute: () => Promise<T>): Promise<T> {
  return answers.keep(key, () => compute().then(deepFreeze));
}

/** How many answers are kept now (for tests and the load check). */
export function keptAnswers(): number {
  return answers.entries.size;
}

function deepFreeze<T>(value: T): T {
  // typed arrays cannot be frozen; nothing in an answer is one, but a future field must not break it
  if (value && typeof value === 'object' && !ArrayBuffer.isView(value) && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
}

/** Called when the public catalogue changes (a curve verified or superseded). */
export function forgetCounts(): void {
  changedAt = Date.now();
  counts.entries.clear();
  answers.entries.clear();
}
