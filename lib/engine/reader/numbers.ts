/**
 * Number scanning: one pass per field, linear in its length whatever the text,
 * so no regular expression ever runs on a user's numbers.
 */

import { MAX_NUMBER_CHARS } from './limits';
import { isSpace } from './text';
import type { DecimalSeparator } from './types';

export function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}

/** Whether a line holds a digit (scanned by hand). */
export function hasDigit(line: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c >= 48 && c <= 57) return true;
  }
  return false;
}

/**
 * A plain decimal number: optional sign, digits with an optional decimal mark
 * (at least one digit in all), optional exponent; spaces around allowed.
 *
 *   number = space* [+-]? (digit+ (mark digit*)? | mark digit+) ([eE] [+-]? digit+)? space*
 *
 * One pass over the field, so its cost is linear in the field's length whatever
 * the text (the pattern this replaces backtracked on long digit runs), and
 * fields over MAX_NUMBER_CHARS are not numbers at all. Number() alone would
 * also accept "", "0x1F" and "Infinity". Returns NaN when the field is not a
 * number; the value is Number() of the decimal written with a point.
 */
export function scanNumber(s: string, mark: DecimalSeparator = '.'): number {
  let i = 0;
  let to = s.length;
  while (i < to && isSpace(s.charCodeAt(i))) i++;
  while (to > i && isSpace(s.charCodeAt(to - 1))) to--;
  if (to - i > MAX_NUMBER_CHARS || to === i) return NaN;
  const from = i;
  const markCode = mark.charCodeAt(0);
  let c = s.charCodeAt(i);
  if (c === 43 || c === 45) i++;
  let digits = 0;
  while (i < to && (c = s.charCodeAt(i)) >= 48 && c <= 57) {
    i++;
    digits++;
  }
  let markAt = -1;
  if (i < to && s.charCodeAt(i) === markCode) {
    markAt = i;
    i++;
    while (i < to && (c = s.charCodeAt(i)) >= 48 && c <= 57) {
      i++;
      digits++;
    }
  }
  if (digits === 0) return NaN;
  if (i < to && ((c = s.charCodeAt(i)) === 101 || c === 69)) {
    i++;
    c = s.charCodeAt(i);
    if (i < to && (c === 43 || c === 45)) i++;
    let exp = 0;
    while (i < to && (c = s.charCodeAt(i)) >= 48 && c <= 57) {
      i++;
      exp++;
    }
    if (exp === 0) return NaN;
  }
  if (i !== to) return NaN;
  if (markAt < 0 || markCode === 46) return Number(s.slice(from, to));
  return Number(`${s.slice(from, markAt)}.${s.slice(markAt + 1, to)}`);
}

export function parseNumber(field: string, decimal: DecimalSeparator): number {
  return scanNumber(field, decimal);
}

/** A field longer than a number may be, made only of characters numbers are written with. */
export function isOverlongNumber(field: string): boolean {
  const t = field.trim();
  if (t.length <= MAX_NUMBER_CHARS) return false;
  for (let i = 0; i < t.length; i++) {
    const c = t.charCodeAt(i);
    if (!((c >= 48 && c <= 57) || c === 43 || c === 45 || c === 46 || c === 44 || c === 101 || c === 69)) return false;
  }
  return true;
}

export function overlongMessage(field: string): string {
  return `a value of ${field.trim().length.toLocaleString('en-US')} characters is longer than the ${MAX_NUMBER_CHARS} a number may have`;
}
