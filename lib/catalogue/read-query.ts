/**
 * What people type in the search box, read into filters: a line name in any usual spelling ("Hα",
 * "H-alpha", "Ha", "OIII", "[O III]", "O3", "S2"), a width ("5 nm", "5nm", "50 Å"), a wavelength
 * ("656 nm"), an optic ("f/2", "F2.8", "40 % obstruction") and a threshold ("80 %"). The rest stays
 * words for the full-text search. The server reads `q` this way for every route that searches, and
 * answers with what it understood, so the API and the page agree.
 *
 * Reading is one pass over the tokens of quantities.ts, each rule looking a few tokens ahead: linear in
 * the length of the text, which is capped (MAX_TYPED_LENGTH); no regular expression runs on it.
 */

import { lineByName } from '@/lib/engine/lines';
import { NUMBER_LIMITS, type LimitedParam } from './limits';
import { fNumberAt, lengthNmAt, percentAt, tokenize, type Read, type Token } from './quantities';
import type { SearchParams } from './search-params';

export type UnderstoodKind = 'line' | 'width' | 'cwl' | 'optic' | 'obstruction' | 'threshold';

export interface Understood {
  kind: UnderstoodKind;
  /** The words it was read from, as typed (a substring of q). */
  text: string;
  /** The search parameters it stands for. */
  params: Partial<Record<'line' | LimitedParam, string | number>>;
  /** False when a parameter of the same kind was given explicitly (that one wins), or the filter needs an optic the search lacks. */
  applied: boolean;
}

/** A width typed in words means "within ±20 %" of it (a filter sold as 5 nm measures 4–6 nm; common practice). */
export const WIDTH_TOLERANCE = 0.2;
/** A wavelength typed in words means a CWL within this many nm of it. */
export const CWL_TOLERANCE_NM = 5;
/** A length in nm below this is a width; at or above, a wavelength. */
const WIDTH_BELOW_NM = 150;

const OBSTRUCTION_WORDS = new Set(['obstruction', 'obstructed', 'obstr', 'obs', 'co']);
/** Symbols a line name may be written with: [O III], H-alpha. */
const NAME_SYMBOLS = new Set(['[', ']', '-']);

const round = (v: number) => Number(v.toPrecision(6));
const inRange = (param: LimitedParam, v: number) => Number.isFinite(v) && v >= NUMBER_LIMITS[param].min && v <= NUMBER_LIMITS[param].max;

/** A line name of up to four tokens from k ("H - alpha", "[ O III ]"), longest first. */
function lineAt(t: Token[], k: number): { id: string; next: number } | null {
  for (let len = Math.min(4, t.length - k); len >= 1; len--) {
    let key = '';
    let ok = true;
    for (let j = k; j < k + len; j++) {
      const tok = t[j];
      if (tok.kind === 'word') key += tok.text;
      else if (!(tok.kind === 'symbol' && NAME_SYMBOLS.has(tok.text))) {
        ok = false;
        break;
      }
    }
    const last = t[k + len - 1];
    if (!ok || key === '' || (t[k].kind === 'symbol' && t[k].text !== '[') || (last.kind === 'symbol' && last.text !== ']')) continue;
    const line = lineByName(key);
    if (line) return { id: line.id, next: k + len };
  }
  return null;
}

/** "obstruction 40 %", "obs 0.4": a word, then a percentage or a ratio (a number above 1 is a percentage). */
function obstructionAfterWord(t: Token[], k: number): Read | null {
  if (t[k]?.kind !== 'word' || !OBSTRUCTION_WORDS.has(t[k].lower)) return null;
  const pc = percentAt(t, k + 1);
  if (pc) return pc;
  const n = t[k + 1];
  if (n?.kind !== 'number') return null;
  return { value: n.value > 1 ? n.value / 100 : n.value, next: k + 2 };
}

/**
 * The filters a text stands for and the words left over. `hasOptic`: the search names an f-number
 * elsewhere, so a bare percentage is a line throughput (else it is a peak transmission).
 */
export function readQueryText(q: string, hasOptic = false): { understood: Omit<Understood, 'applied'>[]; words: string } {
  const t = tokenize(q);
  const used = new Uint8Array(t.length);
  const found: (Omit<Understood, 'applied'> & { threshold?: number })[] = [];
  const seen = new Set<UnderstoodKind>();
  const take = (kind: UnderstoodKind, k: number, next: number, params: Understood['params'], threshold?: number) => {
    // the first of a kind is read; a second stays words
    if (seen.has(kind)) return false;
    seen.add(kind);
    for (let j = k; j < next; j++) used[j] = 1;
    found.push({ kind, text: q.slice(t[k].start, t[next - 1].end), params, threshold });
    return true;
  };
  for (let k = 0; k < t.length; k++) {
    const line = lineAt(t, k);
    if (line && take('line', k, line.next, { line: line.id })) {
      k = line.next - 1;
      continue;
    }
    const f = fNumberAt(t, k);
    if (f && inRange('fNumber', f.value) && take('optic', k, f.next, { fNumber: round(f.value) })) {
      k = f.next - 1;
      continue;
    }
    const obs = obstructionAfterWord(t, k);
    if (obs && inRange('obstruction', obs.value) && take('obstruction', k, obs.next, { obstruction: round(obs.value) })) {
      k = obs.next - 1;
      continue;
    }
    const pc = percentAt(t, k);
    if (pc) {
      const w = t[pc.next];
      if (w?.kind === 'word' && OBSTRUCTION_WORDS.has(w.lower)) {
        if (inRange('obstruction', pc.value) && take('obstruction', k, pc.next + 1, { obstruction: round(pc.value) })) k = pc.next;
        continue;
      }
      if (inRange('minThroughput', pc.value) && take('threshold', k, pc.next, {}, round(pc.value))) k = pc.next - 1;
      continue;
    }
    const len = lengthNmAt(t, k);
    if (len && len.value < WIDTH_BELOW_NM) {
      const lo = round(len.value * (1 - WIDTH_TOLERANCE));
      const hi = round(len.value * (1 + WIDTH_TOLERANCE));
      if (len.value > 0 && inRange('fwhmMax', hi) && take('width', k, len.next, { fwhmMin: lo, fwhmMax: hi })) k = len.next - 1;
    } else if (len) {
      const lo = round(len.value - CWL_TOLERANCE_NM);
      const hi = round(len.value + CWL_TOLERANCE_NM);
      if (inRange('cwlMin', lo) && inRange('cwlMax', hi) && take('cwl', k, len.next, { cwlMin: lo, cwlMax: hi })) k = len.next - 1;
    }
  }
  // a percentage is a line throughput on an optic, else a peak transmission
  const optic = hasOptic || seen.has('optic');
  const understood = found.map(({ threshold, ...u }) => (u.kind === 'threshold' ? { ...u, params: optic ? { minThroughput: threshold! } : { peakMin: threshold! } } : u));

  // the words left, spaced as typed; punctuation alone is not a word
  let words = '';
  let gap = false;
  let anyWord = false;
  for (let k = 0; k < t.length; k++) {
    if (used[k]) {
      gap = true;
      continue;
    }
    if (words && (gap || t[k].start > t[k - 1].end)) words += ' ';
    words += t[k].text;
    gap = false;
    if (t[k].kind !== 'symbol') anyWord = true;
  }
  return { understood, words: anyWord ? words : '' };
}

/** Parameters that, given explicitly, take the place of what the words say of the same kind. */
const SAME_KIND: Record<UnderstoodKind, (keyof SearchParams)[]> = {
  line: ['line'],
  width: ['fwhmMin', 'fwhmMax', 'fwhmBucket'],
  cwl: ['cwlMin', 'cwlMax'],
  optic: ['fNumber'],
  obstruction: ['obstruction'],
  threshold: ['minThroughput', 'peakMin'],
};

export interface ReadSearch {
  /** The search with what the words say applied and `q` holding the words left (undefined when none). */
  params: SearchParams;
  understood: Understood[];
  words: string;
}

/** Applies the words of `p.q` to the search (explicit parameters win). */
export function readSearchWords(p: SearchParams): ReadSearch {
  if (!p.q) return { params: p, understood: [], words: '' };
  const read = readQueryText(p.q, p.fNumber !== undefined);
  const params: SearchParams = { ...p, q: read.words || undefined };
  const opticAfter = p.fNumber !== undefined || read.understood.some((u) => u.kind === 'optic');
  const understood: Understood[] = read.understood.map((u) => {
    const explicit = SAME_KIND[u.kind].some((k) => p[k] !== undefined);
    // an obstruction is part of an optic
    const applied = !explicit && (u.kind !== 'obstruction' || opticAfter);
    if (applied) Object.assign(params, u.params);
    return { ...u, applied };
  });
  return { params, understood, words: read.words };
}
