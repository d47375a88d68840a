/**
 * Layout detection: which delimiter and decimal mark the file uses (sniffed on
 * a bounded prefix), and where its data rows begin.
 */

import { EngineInputError, type LineDetail } from '../errors';
import { splitLine, tooManyColumns } from './fields';
import { MAX_COLUMNS, MAX_NUMBER_CHARS } from './limits';
import { isOverlongNumber, overlongMessage, parseNumber } from './numbers';
import { fail, isBlank, isSkippable } from './text';
import type { DecimalSeparator, Delimiter, ReadOptions } from './types';

const SNIFF_LINES = 200;

/**
 * The layout is guessed from a bounded prefix: at most SNIFF_LINES rows, each
 * cut to SNIFF_LINE_CHARS (a row of MAX_COLUMNS numbers of MAX_NUMBER_CHARS
 * fits), and at most SNIFF_CHARS characters in all.
 */
const SNIFF_LINE_CHARS = 8 * 1024;

const SNIFF_CHARS = 1024 * 1024;

export interface Layout {
  delimiter: Delimiter;
  decimal: DecimalSeparator;
}

const LAYOUTS: Layout[] = [
  { delimiter: '\t', decimal: '.' },
  { delimiter: '\t', decimal: ',' },
  { delimiter: ';', decimal: '.' },
  { delimiter: ';', decimal: ',' },
  { delimiter: ',', decimal: '.' },
  { delimiter: 'whitespace', decimal: '.' },
  { delimiter: 'whitespace', decimal: ',' },
];

interface RowShape {
  numeric: number;
  nonEmpty: number;
  /** More than MAX_COLUMNS fields (only the first MAX_COLUMNS are counted). */
  wide: boolean;
}

function shapeOf(line: string, layout: Layout): RowShape {
  const fields = splitLine(line, layout.delimiter);
  const wide = fields.length > MAX_COLUMNS;
  let numeric = 0;
  let nonEmpty = 0;
  for (let k = 0; k < Math.min(fields.length, MAX_COLUMNS); k++) {
    const f = fields[k];
    if (isBlank(f)) continue;
    nonEmpty++;
    if (!Number.isNaN(parseNumber(f, layout.decimal))) numeric++;
  }
  return { numeric, nonEmpty, wide };
}

function isDataShape(s: RowShape): boolean {
  return s.numeric >= 2 && s.numeric * 2 >= s.nonEmpty;
}

/** Scores each layout on the first lines; rows made only of numbers count double. */
export function sniffLayout(lines: string[], from: number, options: ReadOptions): Layout {
  const candidates = LAYOUTS.filter(
    (l) =>
      (!options.delimiter || l.delimiter === options.delimiter) && (!options.decimalSeparator || l.decimal === options.decimalSeparator),
  );
  if (candidates.length === 0) {
    // a comma delimiter with a decimal comma is the only combination not listed
    throw new EngineInputError('A comma cannot be both the delimiter and the decimal separator.', [
      { field: 'decimalSeparator', message: 'choose another delimiter or a decimal point' },
    ]);
  }
  const sample: string[] = [];
  let budget = SNIFF_CHARS;
  for (let i = from; i < lines.length && sample.length < SNIFF_LINES && budget > 0; i++) {
    const line = lines[i].length > SNIFF_LINE_CHARS ? lines[i].slice(0, SNIFF_LINE_CHARS) : lines[i];
    budget -= line.length + 1;
    if (!isSkippable(line)) sample.push(line);
  }
  let best = candidates[0];
  let bestScore = -1;
  for (const layout of candidates) {
    if (layout.delimiter !== 'whitespace' && !sample.some((l) => l.includes(layout.delimiter))) continue;
    let score = 0;
    for (const line of sample) {
      const s = shapeOf(line, layout);
      if (isDataShape(s)) score += s.numeric === s.nonEmpty ? 2 : 1;
    }
    if (score > bestScore) {
      bestScore = score;
      best = layout;
    }
  }
  return best;
}

/**
 * The first data row is a row made only of numbers (two or more) after which at
 * least two of the next three rows hold as many numbers. One bad value early in
 * the data then still fails loudly on its own line, while a stray preamble line
 * (a date written with commas, a serial number) is not taken for data. Rows
 * with a text column are accepted as a second choice.
 */
export function findDataStart(lines: string[], from: number, layout: Layout): number {
  const next = (i: number) => {
    let j = i + 1;
    while (j < lines.length && isSkippable(lines[j])) j++;
    return j;
  };
  const scan = (strict: boolean) => {
    for (let i = from; i < lines.length; i++) {
      if (isSkippable(lines[i])) continue;
      const s0 = shapeOf(lines[i], layout);
      if (!isDataShape(s0) || (strict && s0.numeric !== s0.nonEmpty)) continue;
      if (s0.wide) fail([tooManyColumns(i + 1)]);
      let looked = 0;
      let good = 0;
      for (let j = next(i); looked < 3 && j < lines.length; j = next(j)) {
        looked++;
        const s = shapeOf(lines[j], layout);
        if (isDataShape(s) && s.numeric === s0.numeric) good++;
      }
      if (looked === 0 ? true : looked < 3 ? good === looked : good >= 2) return i;
    }
    return -1;
  };
  const strict = scan(true);
  const start = strict >= 0 ? strict : scan(false);
  if (start < 0) return start;
  // rows just above that begin with a number and have as many fields are data
  // with a bad value, not preamble: keep them so the bad value is reported
  const width = splitLine(lines[start], layout.delimiter).length;
  if (width > MAX_COLUMNS) fail([tooManyColumns(start + 1)]);
  let first = start;
  for (let i = start - 1; i >= from; i--) {
    if (isSkippable(lines[i])) continue;
    const f = splitLine(lines[i], layout.delimiter);
    if (f.length !== width || Number.isNaN(parseNumber(f[0], layout.decimal))) break;
    first = i;
  }
  return first;
}

/** The first line (after `from`) holding a field that looks like a number but is too long to be one. */
export function firstOverlongNumber(lines: string[], from: number, delimiter: Delimiter): LineDetail | null {
  for (let i = from; i < lines.length; i++) {
    if (lines[i].length <= MAX_NUMBER_CHARS || isSkippable(lines[i])) continue;
    for (const f of splitLine(lines[i], delimiter)) if (isOverlongNumber(f)) return { line: i + 1, message: overlongMessage(f) };
  }
  return null;
}
