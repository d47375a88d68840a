/**
 * Layout detection: which delimiter and decimal mark the file uses (sniffed on
 * a bounded prefix), and where its blocks of data rows lie.
 */

import { EngineInputError, type LineDetail } from '../errors';
import { splitLine } from './fields';
import { MAX_COLUMNS, MAX_NUMBER_CHARS } from './limits';
import { isOverlongNumber, overlongMessage, parseNumber } from './numbers';
import { isBlank, isSkippable } from './text';
import type { DecimalSeparator, Delimiter, ReadOptions, SkippedLines } from './types';

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
  /** Fields in the row, MAX_COLUMNS + 1 standing for "more than MAX_COLUMNS" (only the first MAX_COLUMNS are looked at). */
  width: number;
  firstNumeric: boolean;
}

function shapeOf(line: string, layout: Layout): RowShape {
  const fields = splitLine(line, layout.delimiter);
  let numeric = 0;
  let nonEmpty = 0;
  let firstNumeric = false;
  for (let k = 0; k < Math.min(fields.length, MAX_COLUMNS); k++) {
    const f = fields[k];
    if (isBlank(f)) continue;
    nonEmpty++;
    if (!Number.isNaN(parseNumber(f, layout.decimal))) {
      numeric++;
      if (k === 0) firstNumeric = true;
    }
  }
  return { numeric, nonEmpty, width: fields.length, firstNumeric };
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

/** A run of data rows: lines start…end (0-based, inclusive) of the file. */
export interface Block {
  start: number;
  end: number;
  /** Rows in it made of numbers with the block's width. */
  rows: number;
  /** Fields per row (capped at MAX_COLUMNS + 1). */
  width: number;
}

/**
 * The data blocks of lines from…to−1: runs of rows of the same shape, so a
 * header above and a footer below (an "End of data" line, a summary, a
 * checksum) fall away. A run starts at a row of numbers (two or more, and at
 * least half of its fields) and goes on through
 *   - rows of numbers with its width,
 *   - rows with its width holding at least one number (a bad value, reported
 *     later on its own line rather than cutting the data in two),
 *   - rows beginning with a number whatever their width (a value missing or
 *     one too many, also reported), when more rows of numbers follow,
 *   - blank and comment lines;
 * anything else ends it: a header row, or two text lines (one text line alone
 * between rows of numbers stays in the run, to be refused on its line, as a
 * typo in the data must not silently cut it short). Rows just above or
 * below that begin with a number and have the block's width are kept in it,
 * so a bad value in the first or last row is reported, not skipped.
 * One shape per line, so the cost is linear in the file.
 */
export function findBlocks(lines: string[], from: number, to: number, layout: Layout): Block[] {
  const blocks: Block[] = [];
  let cur: Block | null = null;
  let edge = -1; // last row of the current run that may end it
  // rows beginning with a number, all of one width, just before the current line
  let leadStart = -1;
  let leadWidth = -1;
  let prev = -1; // the last line before this one that is not blank or a comment
  let gap = false; // the current run has met one text line
  let gapHeader = false; // …that looks like a header row (its width, no numbers)
  const close = () => {
    if (cur) blocks.push({ ...cur, end: edge });
    cur = null;
  };
  for (let i = from; i < to; i++) {
    const line = lines[i];
    if (isSkippable(line)) continue;
    const s = shapeOf(line, layout);
    const data = isDataShape(s);
    const after = prev;
    prev = i;
    if (cur !== null) {
      const c: Block = cur;
      if (gap) {
        // one stray text line between rows of numbers is a bad row of the data, reported
        // later on its line; a header row or two text lines part two blocks
        if (data && s.width === c.width && !gapHeader) {
          gap = false;
          c.rows++;
          edge = i;
          continue;
        }
        gap = false;
        close();
      } else {
        if (s.width === c.width && data) {
          c.rows++;
          edge = i;
          continue;
        }
        if (s.width === c.width && s.numeric > 0) {
          if (s.firstNumeric && edge === after) edge = i;
          continue;
        }
        if (s.firstNumeric) continue;
        gap = true;
        gapHeader = s.width === c.width && s.numeric === 0;
        continue;
      }
    }
    if (data) {
      const start = leadWidth === s.width && leadStart >= 0 ? leadStart : i;
      cur = { start, end: i, rows: 1, width: s.width };
      edge = i;
      leadStart = -1;
      leadWidth = -1;
    } else if (s.firstNumeric) {
      if (leadWidth !== s.width) {
        leadStart = i;
        leadWidth = s.width;
      }
    } else {
      leadStart = -1;
      leadWidth = -1;
    }
  }
  close();
  return blocks;
}

/** Runs of two or more rows of numbers are blocks; a lone row of numbers (a date, a serial number) is not, unless nothing else is. */
export function dataBlocks(runs: Block[]): Block[] {
  const real = runs.filter((b) => b.rows >= 2);
  return real.length > 0 ? real : runs;
}

/**
 * The block asked for, else the first one when the caller set the header
 * lines, the last one when they set only the footer lines, else the largest
 * (the first of equals).
 */
export function chooseBlock(blocks: Block[], options: ReadOptions): Block {
  if (options.block !== undefined) return blocks[options.block - 1];
  if (options.headerLines !== undefined) return blocks[0];
  if (options.footerLines !== undefined) return blocks[blocks.length - 1];
  let best = blocks[0];
  for (const b of blocks) if (b.rows > best.rows) best = b;
  return best;
}

export function firstContentLine(lines: string[], from: number, to: number): number {
  for (let i = from; i < to; i++) if (!isSkippable(lines[i])) return i;
  return from;
}

export function lastContentLine(lines: string[], from: number, to: number): number {
  for (let i = to - 1; i >= from; i--) if (!isSkippable(lines[i])) return i;
  return to - 1;
}

function firstText(lines: string[], from: number, to: number): string | null {
  for (let i = from; i <= to; i++) {
    if (isSkippable(lines[i])) continue;
    const t = lines[i].trim();
    return t.length > 60 ? `${t.slice(0, 59)}…` : t;
  }
  return null;
}

/**
 * What lies outside the data read: the header above, other blocks, and the
 * footer below, each as a stretch of lines with its first line of text.
 * Stretches of only blank and comment lines are not reported.
 */
export function skippedLines(lines: string[], start: number, end: number, blocks: Block[], chosen: Block): SkippedLines[] {
  const out: SkippedLines[] = [];
  const add = (from: number, to: number, what: SkippedLines['what']) => {
    if (to < from) return;
    const text = firstText(lines, from, to);
    if (text !== null) out.push({ from: from + 1, to: to + 1, what, text });
  };
  const before = blocks.filter((b) => b.end < start && b !== chosen);
  const after = blocks.filter((b) => b.start > end && b !== chosen);
  // the header is what lies just above the data, below any earlier block
  let cursor = 0;
  for (const b of before) {
    add(cursor, b.start - 1, cursor === 0 ? 'header' : 'footer');
    add(b.start, b.end, 'other block');
    cursor = b.end + 1;
  }
  add(cursor, start - 1, 'header');
  cursor = end + 1;
  for (const b of after) {
    add(cursor, b.start - 1, 'footer');
    add(b.start, b.end, 'other block');
    cursor = b.end + 1;
  }
  add(cursor, lines.length - 1, 'footer');
  return out;
}

/** The first line (after `from`) holding a field that looks like a number but is too long to be one. */
export function firstOverlongNumber(lines: string[], from: number, delimiter: Delimiter): LineDetail | null {
  for (let i = from; i < lines.length; i++) {
    if (lines[i].length <= MAX_NUMBER_CHARS || isSkippable(lines[i])) continue;
    for (const f of splitLine(lines[i], delimiter)) if (isOverlongNumber(f)) return { line: i + 1, message: overlongMessage(f) };
  }
  return null;
}
