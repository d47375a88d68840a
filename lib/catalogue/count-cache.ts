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
/**
 * A whole answer is kept longer: its key holds the catalogue version, so it stays true until the
 * catalogue changes, and the time limit only lets unused answers go. Each answer's limit is drawn
 * between three quarters of this and all of it, so answers kept in the same second do not all
 * lapse in the same second (that made the slowest answers of a busy minute twice as slow).
 */
export const ANSWER_TTL_MS = 5 * 60_000;
const SETTLE_MS = 2_000;
let changedAt = -Infinity;

type Entry = { until: number; value: Promise<unknown> };

/** A small LRU of promised values under version-bearing keys, `maxEntries` long, each kept up to `ttlMs` (`spread` of it drawn at random). */
function keeper(maxEntries: number, ttlMs: number, spread = 0) {
  const entries = new Map<string, Entry>();
  const keep = <T>(key: string, compute: () => Promise<T>): Promise<T> => {
    const now = Date.now();
    const hit = entries.get(key);
    if (hit && now < hit.until) {
      // refresh recency so the map behaves as a small LRU
      entries.delete(key);
      entries.set(key, hit);
      return hit.value as Promise<T>;
    }
    const value = compute();
    if (now - changedAt < SETTLE_MS) return value;
    entries.set(key, { until: now + ttlMs * (1 - spread * Math.random()), value });
    // a failure is not remembered
    value.catch(() => entries.delete(key));
    while (entries.size > maxEntries) entries.delete(entries.keys().next().value as string);
    return value;
  };
  return { keep, entries };
}

// A count is a few dozen small groups; an answer is a page of rows with their sparklines
// (about 30 kB as JSON), so fewer answers are kept: 200 of them stay near 10 MB.
const counts = keeper(500, COUNT_TTL_MS);
const answers = keeper(200, ANSWER_TTL_MS, 0.25);

export const cachedCounts = counts.keep;

/**
 * A signed-out visitor's whole answer. The value is frozen, so one caller cannot change what
 * the next is given.
 */
export function cachedAnswer<T extends object>(key: string, compute: () => Promise<T>): Promise<T> {
  return answers.keep(key, () => compute().then(deepFreeze));
}

/** How many answers this process keeps now (for tests). */
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
