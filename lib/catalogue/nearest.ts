/**
 * When a search finds nothing: the nearest answers, each with the number of curves it would find,
 * counted by running it (never guessed). The best line throughput any matching curve reaches on the
 * optic (computed exactly, as the page shows it), then one relaxation per filter that is set: a wider
 * FWHM, a lower threshold, each curve's own n_eff, and so on.
 */

import { bucketIndex } from './filters';
import type { ReadSearch } from './read-query';
import { FWHM_BUCKETS, hasFitness, type SearchParams } from './search-params';

export interface Relaxation {
  label: string;
  /** The change to the query string: a value to set, or null to remove the parameter. */
  params: Record<string, string | null>;
  /** How many curves the relaxed search finds. */
  total: number;
}

export interface Nearest {
  /** The best line throughput (exact) a curve matching every other filter reaches on the optic; absent when none does. */
  bestThroughput?: number;
  relaxations: Relaxation[];
}

/** At most this many relaxed searches are run for one empty answer. */
export const MAX_RELAXATIONS = 8;

type Change = Partial<Record<keyof SearchParams, number | string | string[] | undefined>>;

const pct = (v: number) => `${Number((v * 100).toPrecision(3))} %`;
const round = (v: number) => Number(v.toPrecision(4));

/** The relaxations worth trying for a search, most telling first. */
function candidates(p: SearchParams, best: number | undefined): { label: string; change: Change }[] {
  const out: { label: string; change: Change }[] = [];
  if (p.minThroughput !== undefined) {
    if (best !== undefined && best > 0) out.push({ label: `the best is ${pct(best)} — show those`, change: { minThroughput: Math.floor(best * 100) / 100 } });
    const lower = Math.round((p.minThroughput - 0.1) * 100) / 100;
    if (lower > 0 && (best === undefined || lower < Math.floor(best * 100) / 100)) out.push({ label: `a lower threshold: keeps at least ${pct(lower)}`, change: { minThroughput: lower } });
    out.push({ label: 'any line throughput', change: { minThroughput: undefined } });
  }
  if (p.fwhmMin !== undefined || p.fwhmMax !== undefined || p.fwhmBucket?.length) {
    let lo = p.fwhmMin;
    let hi = p.fwhmMax;
    for (const key of p.fwhmBucket ?? []) {
      const [a, b] = FWHM_BUCKETS[bucketIndex(key)];
      lo = Math.min(lo ?? a, a);
      hi = b === null ? undefined : Math.max(hi ?? b, b);
    }
    const wideLo = lo !== undefined && lo > 0 ? round(lo / 1.5) : undefined;
    const wideHi = hi !== undefined ? round(hi * 1.5) : undefined;
    const range = wideLo !== undefined && wideHi !== undefined ? `${wideLo}–${wideHi} nm` : wideHi !== undefined ? `up to ${wideHi} nm` : `from ${wideLo} nm`;
    out.push({ label: `a wider FWHM: ${range}`, change: { fwhmMin: wideLo, fwhmMax: wideHi, fwhmBucket: undefined } });
    out.push({ label: 'any FWHM', change: { fwhmMin: undefined, fwhmMax: undefined, fwhmBucket: undefined } });
  }
  if (p.peakMin !== undefined) {
    const lower = Math.round((p.peakMin - 0.1) * 100) / 100;
    out.push(lower > 0 ? { label: `a lower peak: at least ${pct(lower)}`, change: { peakMin: lower } } : { label: 'any peak transmission', change: { peakMin: undefined } });
  }
  if (p.nEff !== undefined) out.push({ label: 'any n_eff (each curve its own)', change: { nEff: undefined } });
  if (p.fieldAngleDeg) out.push({ label: 'on axis (field angle 0°)', change: { fieldAngleDeg: undefined } });
  if (p.cwlMin !== undefined || p.cwlMax !== undefined) out.push({ label: 'any CWL', change: { cwlMin: undefined, cwlMax: undefined } });
  if (p.method) out.push({ label: 'any instrument', change: { method: undefined } });
  if (p.aoiMin !== undefined || p.aoiMax !== undefined) out.push({ label: 'any measurement AOI', change: { aoiMin: undefined, aoiMax: undefined } });
  if (p.q) out.push({ label: `without the words “${p.q}”`, change: { q: undefined } });
  if (p.line) out.push({ label: 'any line', change: { line: undefined } });
  if (p.contributor) out.push({ label: 'every contributor', change: { contributor: undefined } });
  return out;
}

/** The query-string change for a relaxation: words that set a changed parameter leave the search box. */
function patchOf(change: Change, read: ReadSearch, typedQ: string | undefined): Record<string, string | null> {
  const patch: Record<string, string | null> = {};
  for (const [k, v] of Object.entries(change)) {
    if (k === 'q') continue;
    patch[k] = v === undefined ? null : Array.isArray(v) ? v.join(',') : String(v);
  }
  let q = typedQ ?? '';
  for (const u of read.understood) {
    if (u.applied && Object.keys(u.params).some((k) => k in change)) {
      const at = q.indexOf(u.text);
      if (at >= 0) q = `${q.slice(0, at)} ${q.slice(at + u.text.length)}`;
    }
  }
  if ('q' in change) {
    // "without the words": what was read from them stays, now as parameters
    q = '';
    for (const u of read.understood) if (u.applied) for (const [k, v] of Object.entries(u.params)) patch[k] ??= String(v);
  }
  const tidy = q.split(' ').filter(Boolean).join(' ');
  if (tidy !== (typedQ ?? '')) patch.q = tidy || null;
  return patch;
}

/**
 * The nearest answers to an empty search. `run` answers a search (its total and, sorted by throughput,
 * the best curve's exact throughput); `typedQ` is the search box as typed.
 */
export async function nearestAnswers(read: ReadSearch, typedQ: string | undefined, run: (p: SearchParams) => Promise<{ total: number; items: { throughput?: number }[] }>): Promise<Nearest> {
  const p = read.params;
  let best: number | undefined;
  if (hasFitness(p) && p.minThroughput !== undefined) {
    const top = await run({ ...p, minThroughput: undefined, sort: 'throughput', dir: 'desc', page: 1, pageSize: 1 });
    best = top.items[0]?.throughput;
  }
  const relaxations: Relaxation[] = [];
  for (const c of candidates(p, best).slice(0, MAX_RELAXATIONS)) {
    const relaxed = { ...p, ...c.change, page: 1, pageSize: 1 } as SearchParams;
    // throughput and contrast orders need an optic; a relaxation never removes one, but keeps the count honest if it did
    if (!hasFitness(relaxed) && (relaxed.sort === 'throughput' || relaxed.sort === 'contrast')) relaxed.sort = undefined;
    let { total } = await run(relaxed);
    let change = c.change;
    // The filter reads the stored grid, which may put the best curve a hair under the exact value the
    // page shows (GRID_ERROR); step the threshold down a point at a time until it is found.
    for (let step = 1; total === 0 && c.change.minThroughput !== undefined && best !== undefined && step <= 2; step++) {
      change = { minThroughput: (Math.floor(best * 100) - step) / 100 };
      ({ total } = await run({ ...relaxed, ...change } as SearchParams));
    }
    relaxations.push({ label: c.label, params: patchOf(change, read, typedQ), total });
  }
  return { ...(best !== undefined ? { bestThroughput: best } : {}), relaxations };
}
