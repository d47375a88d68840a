/**
 * Numbers with units as people type them, read one way for the catalogue's number fields and for the
 * words of a search (read-query.ts): "f/2", "F2.8", "80 %", "80%", "5 nm", "5nm", "50 Å", "40 %"
 * obstruction. Text is cut into tokens by one left-to-right pass (no regular expression ever runs on
 * it), and each rule below reads a few tokens from a position, so reading is linear in the length.
 */

import { NUMBER_LIMITS, type LimitedParam } from './limits';

/** What a reader reads at most; the rest is ignored (the search box takes 200 characters). */
export const MAX_TYPED_LENGTH = 200;

export interface Token {
  kind: 'number' | 'word' | 'symbol';
  /** As typed. */
  text: string;
  /** Lower case (words), for comparison. */
  lower: string;
  /** For numbers. */
  value: number;
  start: number;
  end: number;
}

const isDigit = (ch: string) => ch >= '0' && ch <= '9';
// a letter in any script: its upper and lower case differ (Å, α, ß aside, which has no upper case of one letter)
const isLetter = (ch: string) => ch.toLowerCase() !== ch.toUpperCase() || ch === 'ß';
const isSpace = (ch: string) => ch === ' ' || ch === '\t' || ch === '\n' || ch === '\r' || ch === '\u00a0' || ch === '\u202f';

/**
 * Tokens of a text: numbers ("2", "2.8", "2,8", ".5"), words (a letter, then letters and digits, with a
 * decimal point between digits: "nm", "f2.8", "O3", "Hα"), and every other character as a symbol.
 */
export function tokenize(input: string): Token[] {
  const text = input.slice(0, MAX_TYPED_LENGTH);
  const out: Token[] = [];
  let i = 0;
  const n = text.length;
  const decimalAt = (k: number) => (text[k] === '.' || text[k] === ',') && k > 0 && isDigit(text[k - 1]) && k + 1 < n && isDigit(text[k + 1]);
  while (i < n) {
    const ch = text[i];
    if (isSpace(ch)) {
      i++;
      continue;
    }
    const start = i;
    if (isDigit(ch) || (ch === '.' && i + 1 < n && isDigit(text[i + 1]))) {
      let seenPoint = false;
      while (i < n && (isDigit(text[i]) || (!seenPoint && (text[i] === '.' || text[i] === ',') && i + 1 < n && isDigit(text[i + 1])))) {
        if (!isDigit(text[i])) seenPoint = true;
        i++;
      }
      const t = text.slice(start, i);
      out.push({ kind: 'number', text: t, lower: t, value: Number(t.replace(',', '.')), start, end: i });
    } else if (isLetter(ch)) {
      while (i < n && (isLetter(text[i]) || isDigit(text[i]) || decimalAt(i))) i++;
      const t = text.slice(start, i);
      out.push({ kind: 'word', text: t, lower: t.toLowerCase(), value: NaN, start, end: i });
    } else {
      // a surrogate pair (an emoji) stays one symbol
      const cp = text.codePointAt(i)!;
      i += cp > 0xffff ? 2 : 1;
      const t = text.slice(start, i);
      out.push({ kind: 'symbol', text: t, lower: t, value: NaN, start, end: i });
    }
  }
  return out;
}

/** A number read from a few tokens: its value in the search's units, and the token after it. */
export interface Read {
  value: number;
  next: number;
}

/** A decimal spelled after a letter inside one word ("f2.8" → 2.8), or null. */
function numberAfter(word: string, from: number): number | null {
  const rest = word.slice(from);
  if (rest === '') return null;
  let points = 0;
  for (let k = 0; k < rest.length; k++) {
    const c = rest[k];
    if (c === '.' || c === ',') points++;
    else if (!isDigit(c)) return null;
  }
  return points > 1 ? null : Number(rest.replace(',', '.'));
}

const at = (t: Token[], k: number, lower: string) => k < t.length && t[k].lower === lower;

/** f/2, f/2.0, F/2, f2, F2.8 (a focal ratio, common practice). */
export function fNumberAt(t: Token[], k: number): Read | null {
  const w = t[k];
  if (!w || w.kind !== 'word' || w.lower[0] !== 'f') return null;
  if (w.lower === 'f' && at(t, k + 1, '/') && t[k + 2]?.kind === 'number') return { value: t[k + 2].value, next: k + 3 };
  const v = numberAfter(w.lower, 1);
  return v === null ? null : { value: v, next: k + 1 };
}

const NM = new Set(['nm', 'nanometre', 'nanometres', 'nanometer', 'nanometers']);
// Å as a letter (U+00C5) or the Ångström sign (U+212B), both lower-cased to å
const ANGSTROM = new Set(['å', 'angstrom', 'angstroms', 'ångström', 'ångströms']);

/** A length in nm: "5 nm", "5nm", "50 Å" (1 Å = 0.1 nm, SI Brochure 9th ed. Table 8). */
export function lengthNmAt(t: Token[], k: number): Read | null {
  const num = t[k];
  if (!num || num.kind !== 'number') return null;
  const unit = t[k + 1];
  if (unit?.kind !== 'word') return null;
  if (NM.has(unit.lower)) return { value: num.value, next: k + 2 };
  if (ANGSTROM.has(unit.lower)) return { value: num.value / 10, next: k + 2 };
  return null;
}

/** "80 %", "80%" → 0.8. */
export function percentAt(t: Token[], k: number): Read | null {
  const num = t[k];
  if (!num || num.kind !== 'number' || !at(t, k + 1, '%')) return null;
  return { value: num.value / 100, next: k + 2 };
}

/** An angle in degrees: "8°", "8 deg". */
function degreesAt(t: Token[], k: number): Read | null {
  const num = t[k];
  if (!num || num.kind !== 'number') return null;
  if (at(t, k + 1, '°') || at(t, k + 1, 'deg') || at(t, k + 1, 'degrees') || at(t, k + 1, 'degree')) return { value: num.value, next: k + 2 };
  return null;
}

const bare = (t: Token[], k: number): Read | null => (t[k]?.kind === 'number' ? { value: t[k].value, next: k + 1 } : null);

/**
 * How each limited search parameter is typed. A bare number is in the parameter's own unit, except
 * where a field shows percent (`percentField`) and for the obstruction, where a number above 1 can only
 * be a percentage (40 → 0.40).
 */
const RULES: Record<LimitedParam, { read: ((t: Token[], k: number) => Read | null)[]; fraction?: boolean }> = {
  cwlMin: { read: [lengthNmAt, bare] },
  cwlMax: { read: [lengthNmAt, bare] },
  fwhmMin: { read: [lengthNmAt, bare] },
  fwhmMax: { read: [lengthNmAt, bare] },
  peakMin: { read: [percentAt, bare], fraction: true },
  aoiMin: { read: [degreesAt, bare] },
  aoiMax: { read: [degreesAt, bare] },
  fNumber: { read: [fNumberAt, bare] },
  obstruction: { read: [percentAt, bare], fraction: true },
  nEff: { read: [bare] },
  fieldAngleDeg: { read: [degreesAt, bare] },
  minThroughput: { read: [percentAt, bare], fraction: true },
};

export interface FieldValue {
  value: number | null;
  error?: string;
}

/**
 * One number field (or one query parameter) as typed: the value in the search's units, null when
 * empty, or a sentence saying what is wrong. `percentField`: the field shows a fraction as percent,
 * so a bare number is a percentage.
 */
export function readQuantity(param: LimitedParam, typed: string, options: { percentField?: boolean } = {}): FieldValue {
  const limits = NUMBER_LIMITS[param];
  const text = typed.trim();
  if (text === '') return { value: null };
  if (text.length > 40) return { value: null, error: `${limits.label}: at most 40 characters` };
  const t = tokenize(text);
  const rule = RULES[param];
  let value: number | null = null;
  for (const read of rule.read) {
    const r = read(t, 0);
    if (r && r.next === t.length) {
      value = r.value;
      if (rule.fraction && read === bare && (options.percentField || (param === 'obstruction' && r.value > 1))) value = r.value / 100;
      break;
    }
  }
  if (value === null || !Number.isFinite(value)) return { value: null, error: `${limits.label}: “${text}” is not a number such as ${limits.example}` };
  if (value < limits.min || value > limits.max) return { value: null, error: `${limits.label} must be between ${limits.min} and ${limits.max}${limits.unit}` };
  // a value read as percent keeps no float dust (0.29 / 100 → 0.0029, not 0.0029000000000000002)
  return { value: Number(value.toPrecision(12)) };
}
