/**
 * The catalogue page's state as its address carries it: one string per parameter, a repeatable one
 * (fwhmBucket) held comma-joined and written out once per value, in a fixed order so equal searches share
 * one link (and the server's first answer is recognised by the page that takes over from it).
 */

import { REPEATABLE } from './search-params';

export type Query = Record<string, string>;

export function queryOf(sp: URLSearchParams | Record<string, string | string[] | undefined>): Query {
  const q: Query = {};
  const put = (k: string, values: string[]) => {
    const kept = values.filter((v) => v !== '');
    if (kept.length) q[k] = REPEATABLE.includes(k) ? kept.join(',') : kept[kept.length - 1];
  };
  if (sp instanceof URLSearchParams) for (const k of new Set(sp.keys())) put(k, sp.getAll(k));
  else for (const [k, v] of Object.entries(sp)) if (v !== undefined) put(k, Array.isArray(v) ? v : [v]);
  return q;
}

export function queryString(q: Query): string {
  const u = new URLSearchParams();
  for (const [k, v] of Object.entries(q).sort(([a], [b]) => a.localeCompare(b))) {
    if (v === '' || v === undefined) continue;
    if (REPEATABLE.includes(k)) for (const one of v.split(',')) u.append(k, one);
    else u.set(k, v);
  }
  return u.toString();
}
