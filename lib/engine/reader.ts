/**
 * Turns an uploaded data file into a clean curve (docs/model.md §1) and says
 * what it assumed. Lab files come in every layout, so the reader guesses
 * delimiter, decimal mark, header block, columns and units, and lets the caller
 * override each guess. Every refusal names the line of the original file.
 *
 * Anyone may upload, so every step is linear in the size of the file: numbers
 * and fields are scanned by hand (no regular expression runs on user text),
 * rows have at most MAX_COLUMNS fields, a number at most MAX_NUMBER_CHARS
 * characters, and the layout is sniffed on a bounded prefix.
 */

import Papa from 'papaparse';
import { MAX_PLAUSIBLE_T, MIN_POINTS, NEGATIVE_NOISE_FLOOR, sortAndCollapse } from './curve';
import { CurveReadError, EngineInputError, type LineDetail } from './errors';
import type { CurvePoints } from './types';

import { MAX_COLUMNS, MAX_FILE_BYTES, MAX_LINES, MAX_NUMBER_CHARS, MAX_ROWS } from './reader-limits';

export { MAX_COLUMNS, MAX_FILE_BYTES, MAX_LINES, MAX_NUMBER_CHARS, MAX_ROWS };

export type WavelengthUnit = 'nm' | 'angstrom' | 'um';
export type TransmissionUnit = 'fraction' | 'percent' | 'od';
export type Delimiter = ',' | ';' | '\t' | 'whitespace';
export type DecimalSeparator = '.' | ',';

export interface ReadOptions {
  wavelengthUnit?: WavelengthUnit;
  transmissionUnit?: TransmissionUnit;
  delimiter?: Delimiter;
  decimalSeparator?: DecimalSeparator;
  /** Lines at the top of the file that are not data (the first data row is line headerLines + 1). */
  headerLines?: number;
  /** 0-based column indexes. */
  wavelengthColumn?: number;
  transmissionColumn?: number;
}

export interface ReadAssumptions {
  wavelengthUnit: WavelengthUnit;
  transmissionUnit: TransmissionUnit;
  delimiter: Delimiter;
  decimalSeparator: DecimalSeparator;
  headerLines: number;
  wavelengthColumn: number;
  transmissionColumn: number;
  columns: string[];
}

export interface ReadResult {
  points: CurvePoints;
  assumed: ReadAssumptions;
  /** Data rows read from the file, before repeats were merged. */
  rowCount: number;
  warnings: string[];
}

const MAX_DETAILS = 20;
const SNIFF_LINES = 200;
/**
 * The layout is guessed from a bounded prefix: at most SNIFF_LINES rows, each
 * cut to SNIFF_LINE_CHARS (a row of MAX_COLUMNS numbers of MAX_NUMBER_CHARS
 * fits), and at most SNIFF_CHARS characters in all.
 */
const SNIFF_LINE_CHARS = 8 * 1024;
const SNIFF_CHARS = 1024 * 1024;
const SAMPLE_ROWS = 1000;

function isSpace(c: number): boolean {
  return c <= 32 || c === 0xa0 || c === 0xfeff;
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

function parseNumber(field: string, decimal: DecimalSeparator): number {
  return scanNumber(field, decimal);
}

/** A field longer than a number may be, made only of characters numbers are written with. */
function isOverlongNumber(field: string): boolean {
  const t = field.trim();
  if (t.length <= MAX_NUMBER_CHARS) return false;
  for (let i = 0; i < t.length; i++) {
    const c = t.charCodeAt(i);
    if (!((c >= 48 && c <= 57) || c === 43 || c === 45 || c === 46 || c === 44 || c === 101 || c === 69)) return false;
  }
  return true;
}

function overlongMessage(field: string): string {
  return `a value of ${field.trim().length.toLocaleString('en-US')} characters is longer than the ${MAX_NUMBER_CHARS} a number may have`;
}

function unquote(s: string): string {
  const t = s.trim();
  return t.length >= 2 && t[0] === '"' && t[t.length - 1] === '"' ? t.slice(1, -1).replaceAll('""', '"') : t;
}

/** Whitespace-separated fields, at most `limit` of them (scanned by hand). */
function splitWhitespace(line: string, limit: number): string[] {
  const out: string[] = [];
  let i = 0;
  const n = line.length;
  while (out.length < limit) {
    while (i < n && isSpace(line.charCodeAt(i))) i++;
    if (i >= n) break;
    const from = i;
    while (i < n && !isSpace(line.charCodeAt(i))) i++;
    out.push(line.slice(from, i));
  }
  return out;
}

/** Fields split at a one-character delimiter, at most `limit` of them. */
function splitAt(line: string, delimiter: string, limit: number): string[] {
  const out: string[] = [];
  let from = 0;
  while (out.length < limit) {
    const to = line.indexOf(delimiter, from);
    if (to < 0) {
      out.push(line.slice(from));
      break;
    }
    out.push(line.slice(from, to));
    from = to + 1;
  }
  return out;
}

/**
 * Fields of one line, at most MAX_COLUMNS + 1 of them (more than MAX_COLUMNS
 * means the row is too wide). Quotes around whole fields are stripped
 * directly; a delimiter inside quotes sends the line through papaparse's CSV
 * rules.
 */
function splitLine(line: string, delimiter: Delimiter, limit = MAX_COLUMNS + 1): string[] {
  if (delimiter === 'whitespace') return splitWhitespace(line, limit);
  const parts = splitAt(line, delimiter, limit);
  if (!line.includes('"')) return parts;
  let simple = true;
  for (const p of parts) {
    const t = p.trim();
    if (t.includes('"') && !(t.length >= 2 && t[0] === '"' && t[t.length - 1] === '"')) {
      simple = false;
      break;
    }
  }
  if (simple) return parts.map(unquote);
  const r = Papa.parse<string[]>(line, { delimiter, quoteChar: '"', skipEmptyLines: false });
  const row = r.data[0];
  return Array.isArray(row) ? row.slice(0, limit).map((f) => f.trim()) : parts.map(unquote);
}

/** The first line (after `from`) holding a field that looks like a number but is too long to be one. */
function firstOverlongNumber(lines: string[], from: number, delimiter: Delimiter): LineDetail | null {
  for (let i = from; i < lines.length; i++) {
    if (lines[i].length <= MAX_NUMBER_CHARS || isSkippable(lines[i])) continue;
    for (const f of splitLine(lines[i], delimiter)) if (isOverlongNumber(f)) return { line: i + 1, message: overlongMessage(f) };
  }
  return null;
}

function tooManyColumns(line: number): LineDetail {
  return { line, message: `the row has more than ${MAX_COLUMNS} columns; a curve file may have at most ${MAX_COLUMNS}` };
}

/** Whether a line holds a digit (scanned by hand). */
function hasDigit(line: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c >= 48 && c <= 57) return true;
  }
  return false;
}

/** Splits text at CRLF, CR or LF; more than MAX_LINES lines is refused (413). */
function splitLines(text: string): string[] {
  const lines: string[] = [];
  let from = 0;
  const n = text.length;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) {
      if (lines.length >= MAX_LINES) {
        throw new CurveReadError(`The file has more than ${MAX_LINES.toLocaleString('en-US')} lines.`, [
          { line: MAX_LINES + 1, message: `line limit of ${MAX_LINES} reached` },
        ], 413);
      }
      lines.push(text.slice(from, i));
      if (c === 13 && text.charCodeAt(i + 1) === 10) i++;
      from = i + 1;
    }
  }
  lines.push(text.slice(from));
  return lines;
}

/** Blank lines and `#` or `//` comments carry no data (scanned by hand: this runs per row). */
function isSkippable(line: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c === 0x20 || c === 0x09 || c === 0x0d || c === 0x0c || c === 0xa0) continue;
    return c === 0x23 || (c === 0x2f && line.charCodeAt(i + 1) === 0x2f);
  }
  return true;
}

function utf8Length(s: string): number {
  if (s.length > MAX_FILE_BYTES) return s.length;
  let n = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c <= 0xdbff) {
      n += 4;
      i++;
    } else n += 3;
  }
  return n;
}

function lineOfIndex(text: string, index: number): number {
  let line = 1;
  for (let i = text.indexOf('\n'); i >= 0 && i < index; i = text.indexOf('\n', i + 1)) line++;
  return line;
}

function lineOfOffset(bytes: Uint8Array, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) if (bytes[i] === 0x0a) line++;
  return line;
}

function binaryError(line: number): CurveReadError {
  return new CurveReadError('This file looks binary, not text; export the curve as CSV or plain text.', [
    { line, message: 'binary content (NUL bytes or mostly non-printable characters)' },
  ]);
}

/** Decodes bytes as UTF-8 (or UTF-16 with a BOM, or Windows-1252 when UTF-8 fails). */
function decode(input: string | Uint8Array): string {
  if (typeof input === 'string') {
    if (utf8Length(input) > MAX_FILE_BYTES) throw tooLarge();
    const nul = input.indexOf('\u0000');
    if (nul >= 0) throw binaryError(lineOfIndex(input, nul));
    return input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
  }
  if (input.length > MAX_FILE_BYTES) throw tooLarge();
  if (input.length >= 2 && ((input[0] === 0xff && input[1] === 0xfe) || (input[0] === 0xfe && input[1] === 0xff))) {
    const text = new TextDecoder(input[0] === 0xff ? 'utf-16le' : 'utf-16be').decode(input);
    if (text.includes('\u0000')) throw binaryError(1);
    return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  }
  const nul = input.indexOf(0);
  if (nul >= 0) throw binaryError(lineOfOffset(input, nul));
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(input);
  } catch {
    return new TextDecoder('windows-1252').decode(input);
  }
}

function tooLarge(): CurveReadError {
  return new CurveReadError(`The file is larger than ${MAX_FILE_BYTES / 1048576} MB.`, [{ line: 1, message: 'file exceeds 5 MB' }], 413);
}

function checkPrintable(text: string): void {
  const n = Math.min(text.length, 65536);
  if (n === 0) return;
  let bad = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0x0c) || c === 0x7f || c === 0xfffd) bad++;
  }
  if (bad > 0.1 * n) throw binaryError(1);
}

interface Layout {
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

function isBlank(f: string): boolean {
  for (let i = 0; i < f.length; i++) if (!isSpace(f.charCodeAt(i))) return false;
  return true;
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
function sniffLayout(lines: string[], from: number, options: ReadOptions): Layout {
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
function findDataStart(lines: string[], from: number, layout: Layout): number {
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

interface HeaderInfo {
  names: string[];
  /** All header text per column (names plus any unit row), lower-cased. */
  text: string[];
}

function isLetter(c: number): boolean {
  return c >= 97 && c <= 122;
}

/**
 * Whether lower-cased header text holds one of `words` standing alone, i.e. with
 * no letter a–z touching it on either side ("nm" in "λ (nm)", not in "nmr").
 * Found with indexOf rather than a pattern so header text costs linear time.
 */
function hasWord(h: string, words: readonly string[]): boolean {
  for (const w of words) {
    for (let at = h.indexOf(w); at >= 0; at = h.indexOf(w, at + 1)) {
      if ((at === 0 || !isLetter(h.charCodeAt(at - 1))) && !isLetter(h.charCodeAt(at + w.length))) return true;
    }
  }
  return false;
}

function hasPart(h: string, parts: readonly string[]): boolean {
  return parts.some((p) => h.includes(p));
}

function isWavelengthHint(h: string): boolean {
  return hasPart(h, ['wave', 'lambda', 'λ']) || hasWord(h, ['wl', 'nm', 'um', 'µm', 'μm', 'å', 'angstrom', 'angstroms', 'ångström', 'ångströms', 'micron', 'microns']);
}

function isTransmissionHint(h: string): boolean {
  return hasPart(h, ['trans', '%', 'sample', 'signal']) || hasWord(h, ['t', 'od', 'abs', 'tau', 'optical density', 'absorbance']);
}

/** Whitespace headers keep "(nm)" or "[%]" with the name before them. */
function splitHeaderCells(body: string, delimiter: Delimiter, ncols: number): string[] {
  if (delimiter !== 'whitespace') return splitLine(body, delimiter).map((f) => f.trim());
  const plain = splitLine(body, delimiter);
  if (plain.length === ncols) return plain;
  const wide = splitWide(body.trim(), ncols + 1);
  if (wide.length === ncols) return wide;
  const merged: string[] = [];
  for (const tok of plain) {
    if (merged.length > 0 && (tok[0] === '(' || tok[0] === '[')) merged[merged.length - 1] += ` ${tok}`;
    else merged.push(tok);
  }
  return merged;
}

/** Cells parted by a tab or by two or more spaces (one space stays inside a name). */
function splitWide(t: string, limit: number): string[] {
  const out: string[] = [];
  let from = 0;
  let i = 0;
  while (i < t.length && out.length < limit) {
    const c = t.charCodeAt(i);
    if (c === 9 || (isSpace(c) && i + 1 < t.length && isSpace(t.charCodeAt(i + 1)))) {
      out.push(t.slice(from, i));
      while (i < t.length && isSpace(t.charCodeAt(i))) i++;
      from = i;
    } else i++;
  }
  if (out.length < limit) out.push(t.slice(from));
  return out;
}

const UNIT_WORDS = new Set(['', 'nm', 'å', 'a', 'um', 'µm', 'μm', '%', 'od', 't', 'fraction', 'abs', 'a.u.', 'au', '-']);

/** A cell that is only a unit, perhaps in brackets: "nm", "(%)", "[a.u.]", "-". */
function isUnitCell(cell: string): boolean {
  let t = cell.trim();
  if (t[0] === '(' || t[0] === '[') t = t.slice(1);
  const last = t[t.length - 1];
  if (last === ')' || last === ']') t = t.slice(0, -1);
  return UNIT_WORDS.has(t.trim().toLowerCase());
}

/** A comment line's text after its leading # marks or //. */
function commentBody(line: string): string {
  let i = 0;
  while (i < line.length && isSpace(line.charCodeAt(i))) i++;
  if (line.charCodeAt(i) === 0x2f) i += 2;
  else while (line.charCodeAt(i) === 0x23) i++;
  while (i < line.length && isSpace(line.charCodeAt(i))) i++;
  return line.slice(i);
}

/**
 * Column names come from the text row just above the data, with a unit row
 * (e.g. "nm,%") under a name row read as well. A commented row ("# wavelength T")
 * counts when its cells line up with the data columns.
 */
function readHeader(lines: string[], dataStart: number, layout: Layout, ncols: number): HeaderInfo {
  const rows: string[][] = [];
  for (let i = dataStart - 1; i >= 0 && rows.length < 2; i--) {
    const line = lines[i];
    if (line.trim() === '') {
      if (rows.length > 0) break;
      continue;
    }
    const comment = isSkippable(line);
    if (comment && rows.length > 0) break;
    const body = comment ? commentBody(line) : line;
    const cells = splitHeaderCells(body, layout.delimiter, ncols);
    while (cells.length > ncols && cells[cells.length - 1] === '') cells.pop();
    const named = cells.some((c) => isWavelengthHint(c.toLowerCase()) || isTransmissionHint(c.toLowerCase()));
    if (cells.length !== ncols || (comment && !named)) {
      if (comment) continue;
      break;
    }
    rows.unshift(cells);
    if (comment) break;
  }
  let nameRow = rows[rows.length - 1];
  if (rows.length === 2 && rows[1].every(isUnitCell)) nameRow = rows[0];
  const names: string[] = [];
  const text: string[] = [];
  for (let c = 0; c < ncols; c++) {
    names.push(nameRow?.[c] || `column ${c + 1}`);
    text.push(rows.map((r) => r[c] ?? '').join(' ').toLowerCase());
  }
  return { names, text };
}

function wavelengthUnitFromHeader(h: string): WavelengthUnit | null {
  if (hasWord(h, ['um', 'µm', 'μm', 'micron', 'microns', 'micrometer', 'micrometers', 'micrometre', 'micrometres'])) return 'um';
  if (hasWord(h, ['a', 'å']) || hasPart(h, ['ångström', 'angstrom'])) return 'angstrom';
  if (hasWord(h, ['nm']) || h.includes('nanomet')) return 'nm';
  return null;
}

function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}

/** "0-1", "0 – 1" or "0…1" standing apart from other digits. */
function hasZeroToOne(h: string): boolean {
  for (let at = h.indexOf('0'); at >= 0; at = h.indexOf('0', at + 1)) {
    if (at > 0 && isDigit(h.charCodeAt(at - 1))) continue;
    let i = at + 1;
    while (i < h.length && isSpace(h.charCodeAt(i))) i++;
    if (h[i] !== '-' && h[i] !== '–' && h[i] !== '…') continue;
    i++;
    while (i < h.length && isSpace(h.charCodeAt(i))) i++;
    if (h[i] === '1' && !isDigit(h.charCodeAt(i + 1))) return true;
  }
  return false;
}

function transmissionUnitFromHeader(h: string): TransmissionUnit | null {
  if (hasPart(h, ['%', 'percent']) || hasWord(h, ['pct'])) return 'percent';
  if (hasWord(h, ['od', 'o.d.', 'abs']) || hasPart(h, ['optical density', 'absorbance'])) return 'od';
  if (h.includes('fraction') || hasZeroToOne(h)) return 'fraction';
  return null;
}

interface ColumnStats {
  numeric: boolean;
  monotone: boolean;
  positive: boolean;
  indexLike: boolean;
  min: number;
  max: number;
}

function columnStats(values: number[]): ColumnStats {
  let numeric = values.length > 0;
  let up = true;
  let down = true;
  let positive = true;
  let indexLike = values.length > 1;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isNaN(v)) {
      numeric = false;
      continue;
    }
    if (v <= 0) positive = false;
    if (v < min) min = v;
    if (v > max) max = v;
    if (i > 0) {
      if (v < values[i - 1]) up = false;
      if (v > values[i - 1]) down = false;
      if (v - values[i - 1] !== 1) indexLike = false;
    }
  }
  if (!Number.isInteger(values[0])) indexLike = false;
  return { numeric, monotone: (up || down) && max > min, positive, indexLike, min, max };
}

function chooseColumns(
  lines: string[],
  dataStart: number,
  layout: Layout,
  ncols: number,
  header: HeaderInfo,
  options: ReadOptions,
): { wc: number; tc: number } {
  const cols: number[][] = Array.from({ length: ncols }, () => []);
  for (let i = dataStart, n = 0; i < lines.length && n < SAMPLE_ROWS; i++) {
    if (isSkippable(lines[i])) continue;
    const f = splitLine(lines[i], layout.delimiter);
    for (let c = 0; c < ncols; c++) cols[c].push(c < f.length ? parseNumber(f[c], layout.decimal) : NaN);
    n++;
  }
  const stats = cols.map(columnStats);
  const wlHint = header.text.map(isWavelengthHint);
  const tHint = header.text.map(isTransmissionHint);

  let wc = options.wavelengthColumn ?? -1;
  if (wc < 0) {
    const ok = (c: number) => stats[c].numeric && stats[c].monotone && stats[c].positive;
    const order = [...Array(ncols).keys()];
    const hinted = order.find((c) => ok(c) && wlHint[c] && !tHint[c]);
    wc = hinted ?? order.find((c) => ok(c) && !stats[c].indexLike) ?? order.find((c) => ok(c)) ?? order.find((c) => stats[c].numeric) ?? 0;
    // a short unsorted file can make a fraction column look monotone; an earlier
    // column of wavelength-sized values is the better guess then
    if (hinted === undefined && stats[wc].max <= MAX_PLAUSIBLE_T) {
      const earlier = order.find((c) => c < wc && stats[c].numeric && stats[c].positive && !stats[c].indexLike && stats[c].max > MAX_PLAUSIBLE_T);
      if (earlier !== undefined) wc = earlier;
    }
  }
  let tc = options.transmissionColumn ?? -1;
  if (tc < 0) {
    const plausible = (c: number) =>
      c !== wc && stats[c].numeric && (transmissionUnitFromHeader(header.text[c]) === 'od' || (stats[c].min >= -0.5 && stats[c].max <= 150));
    const order = [...Array(ncols).keys()];
    const after = order.filter((c) => c > wc).concat(order.filter((c) => c < wc));
    tc =
      after.find((c) => plausible(c) && tHint[c] && !wlHint[c]) ??
      after.find((c) => plausible(c) && !stats[c].indexLike) ??
      after.find((c) => plausible(c)) ??
      after.find((c) => stats[c].numeric) ??
      after[0];
  }
  return { wc, tc };
}

function validateOptions(o: ReadOptions, lineCount: number): void {
  const bad = (field: string, message: string) => {
    throw new EngineInputError(`Invalid read option: ${message}.`, [{ field, message }]);
  };
  if (o.wavelengthUnit && !['nm', 'angstrom', 'um'].includes(o.wavelengthUnit)) bad('wavelengthUnit', 'use nm, angstrom or um');
  if (o.transmissionUnit && !['fraction', 'percent', 'od'].includes(o.transmissionUnit)) bad('transmissionUnit', 'use fraction, percent or od');
  if (o.delimiter && ![',', ';', '\t', 'whitespace'].includes(o.delimiter)) bad('delimiter', 'use ",", ";", a tab or "whitespace"');
  if (o.decimalSeparator && !['.', ','].includes(o.decimalSeparator)) bad('decimalSeparator', 'use "." or ","');
  if (o.headerLines !== undefined && (!Number.isInteger(o.headerLines) || o.headerLines < 0 || o.headerLines > lineCount)) {
    bad('headerLines', 'headerLines must be a whole number no larger than the number of lines');
  }
  for (const f of ['wavelengthColumn', 'transmissionColumn'] as const) {
    const v = o[f];
    if (v !== undefined && (!Number.isInteger(v) || v < 0 || v >= MAX_COLUMNS)) bad(f, `${f} must be a 0-based column index from 0 to ${MAX_COLUMNS - 1}`);
  }
  if (o.wavelengthColumn !== undefined && o.wavelengthColumn === o.transmissionColumn) {
    bad('transmissionColumn', 'wavelength and transmission must be different columns');
  }
}

function describeWl(u: WavelengthUnit): string {
  return u === 'angstrom' ? 'Å' : u === 'um' ? 'µm' : 'nm';
}

function fail(details: LineDetail[], status: 422 | 413 = 422): never {
  const first = details[0];
  const more = details.length > 1 ? ` (and ${details.length - 1} more problem${details.length > 2 ? 's' : ''})` : '';
  throw new CurveReadError(`Line ${first.line}: ${first.message}${more}.`, details, status);
}

/** Plain array from a typed one (a loop is several times faster than Array.from here). */
function toArray(a: Float64Array): number[] {
  const out = new Array<number>(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  return out;
}

export function readCurveText(input: string | Uint8Array, options: ReadOptions = {}): ReadResult {
  const text = decode(input);
  checkPrintable(text);
  const lines = splitLines(text);
  if (lines.length > 0 && lines[lines.length - 1] === '') lines.pop();
  validateOptions(options, lines.length);
  const warnings: string[] = [];

  const from = options.headerLines ?? 0;
  const layout = sniffLayout(lines, from, options);

  let dataStart: number;
  if (options.headerLines !== undefined) {
    dataStart = lines.findIndex((l, i) => i >= from && !isSkippable(l));
  } else {
    dataStart = findDataStart(lines, from, layout);
  }
  if (dataStart < 0) {
    const overlong = firstOverlongNumber(lines, from, layout.delimiter);
    if (overlong) fail([overlong]);
    const single = lines.findIndex((l) => !isSkippable(l) && !Number.isNaN(parseNumber(l, layout.decimal)));
    if (single >= 0) {
      fail([{ line: single + 1, message: 'only one column of numbers was found; a curve needs a wavelength column and a transmission column' }]);
    }
    fail([{ line: 1, message: 'no rows of numbers were found in this file' }]);
  }

  // modal field count of the first rows decides how many columns there are
  const counts = new Map<number, number>();
  for (let i = dataStart, n = 0; i < lines.length && n < 50; i++) {
    if (isSkippable(lines[i])) continue;
    const k = splitLine(lines[i], layout.delimiter).length;
    counts.set(k, (counts.get(k) ?? 0) + 1);
    n++;
  }
  let ncols = 0;
  let bestCount = -1;
  for (const [k, v] of counts) if (v > bestCount || (v === bestCount && k > ncols)) [ncols, bestCount] = [k, v];
  if (ncols > MAX_COLUMNS) fail([tooManyColumns(dataStart + 1)]);
  if (ncols < 2) {
    fail([{ line: dataStart + 1, message: 'only one column of numbers was found; a curve needs a wavelength column and a transmission column' }]);
  }
  for (const f of ['wavelengthColumn', 'transmissionColumn'] as const) {
    const v = options[f];
    if (v !== undefined && v >= ncols) {
      fail([{ line: dataStart + 1, message: `${f} ${v} does not exist; the data rows have ${ncols} columns (0 to ${ncols - 1})` }]);
    }
  }

  const header = readHeader(lines, dataStart, layout, ncols);
  const { wc, tc } = chooseColumns(lines, dataStart, layout, ncols, header, options);
  if (tc === undefined || tc === wc) {
    fail([{ line: dataStart + 1, message: 'no transmission column could be told apart from the wavelength column' }]);
  }
  if (ncols > 2 && (options.wavelengthColumn === undefined || options.transmissionColumn === undefined)) {
    warnings.push(`The file has ${ncols} columns; "${header.names[wc]}" was read as wavelength and "${header.names[tc]}" as transmission.`);
  }

  // read every data row into typed arrays (a 200 000-row file must parse in well under a second)
  const errors: LineDetail[] = [];
  const cap = Math.max(0, Math.min(lines.length - dataStart, MAX_ROWS));
  const wlRaw = new Float64Array(cap);
  const tRaw = new Float64Array(cap);
  const lineNo = new Int32Array(cap);
  let n = 0;
  const { delimiter, decimal } = layout;
  const plain = delimiter !== 'whitespace' && decimal === '.';
  const need = Math.max(wc, tc);
  for (let i = dataStart; i < lines.length; i++) {
    const line = lines[i];
    if (isSkippable(line)) continue;
    if (n >= MAX_ROWS) {
      throw new CurveReadError(`The file has more than ${MAX_ROWS.toLocaleString('en-US')} data rows.`, [
        { line: i + 1, message: `row limit of ${MAX_ROWS} reached` },
      ], 413);
    }
    let fw = '';
    let ft = '';
    let seen = 0;
    if (plain && line.indexOf('"') < 0) {
      // walk the row once, keeping the two wanted fields and counting the rest
      let from = 0;
      while (seen <= MAX_COLUMNS) {
        let to = line.indexOf(delimiter, from);
        if (to < 0) to = line.length;
        if (seen === wc) fw = line.slice(from, to);
        if (seen === tc) ft = line.slice(from, to);
        seen++;
        if (to === line.length) break;
        from = to + 1;
      }
    } else {
      const f = splitLine(line, delimiter);
      seen = f.length;
      if (seen > need) {
        fw = f[wc];
        ft = f[tc];
      }
    }
    if (seen > MAX_COLUMNS) {
      errors.push(tooManyColumns(i + 1));
      if (errors.length >= MAX_DETAILS) break;
      continue;
    }
    if (seen <= need) {
      const found = splitLine(line, delimiter).filter((f) => f.trim() !== '').length;
      errors.push({
        line: i + 1,
        message: hasDigit(line)
          ? `expected at least ${need + 1} values but found ${found}`
          : `"${line.trim().slice(0, 40)}" is not a row of numbers (comment it out with #)`,
      });
      if (errors.length >= MAX_DETAILS) break;
      continue;
    }
    const w = parseNumber(fw, decimal);
    const t = parseNumber(ft, decimal);
    if (Number.isNaN(w) || Number.isNaN(t)) {
      const badField = Number.isNaN(w) ? fw : ft;
      const message = badField.trim().length > MAX_NUMBER_CHARS ? overlongMessage(badField) : `"${badField.trim().slice(0, 40)}" is not a readable number`;
      errors.push({ line: i + 1, message });
      if (errors.length >= MAX_DETAILS) break;
      continue;
    }
    wlRaw[n] = w;
    tRaw[n] = t;
    lineNo[n] = i + 1;
    n++;
  }
  if (errors.length > 0) fail(errors);

  // units
  let wlMin = Infinity;
  let wlMax = -Infinity;
  let tMax = -Infinity;
  for (let i = 0; i < n; i++) {
    if (wlRaw[i] < wlMin) wlMin = wlRaw[i];
    if (wlRaw[i] > wlMax) wlMax = wlRaw[i];
    if (tRaw[i] > tMax) tMax = tRaw[i];
  }
  let wavelengthUnit = options.wavelengthUnit ?? wavelengthUnitFromHeader(header.text[wc]);
  if (!wavelengthUnit) {
    if (wlMin > 0 && wlMax <= 5) wavelengthUnit = 'um';
    else if (wlMin >= 1000 && wlMax > 3000) wavelengthUnit = 'angstrom';
    else wavelengthUnit = 'nm';
    if (wavelengthUnit !== 'nm') {
      warnings.push(`Wavelengths were read as ${describeWl(wavelengthUnit)} from their size (${wlMin}–${wlMax}); set the unit if that is wrong.`);
    }
  }
  let transmissionUnit = options.transmissionUnit ?? transmissionUnitFromHeader(header.text[tc]);
  if (!transmissionUnit) {
    transmissionUnit = tMax > MAX_PLAUSIBLE_T ? 'percent' : 'fraction';
    if (transmissionUnit === 'percent') warnings.push(`Transmission was read as percent because values reach ${tMax}.`);
  }

  // convert and check values
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  let clamped = 0;
  const tLabel = (v: number) => (transmissionUnit === 'percent' ? `${v} %` : transmissionUnit === 'od' ? `OD ${v}` : `${v}`);
  for (let i = 0; i < n; i++) {
    // dividing by 10 keeps Å values that are exact decimals at the nearest double
    const w = wavelengthUnit === 'angstrom' ? wlRaw[i] / 10 : wavelengthUnit === 'um' ? wlRaw[i] * 1000 : wlRaw[i];
    if (!(w > 0) || !Number.isFinite(w)) {
      errors.push({ line: lineNo[i], message: `wavelength ${wlRaw[i]} is not a positive finite number` });
    }
    const r = tRaw[i];
    let t = transmissionUnit === 'percent' ? r / 100 : transmissionUnit === 'od' ? 10 ** -r : r;
    if (!Number.isFinite(t)) {
      errors.push({ line: lineNo[i], message: `transmission ${tLabel(r)} is not a finite number` });
    } else if (t < NEGATIVE_NOISE_FLOOR) {
      errors.push({ line: lineNo[i], message: `transmission ${tLabel(r)} is negative beyond instrument noise` });
    } else if (t > MAX_PLAUSIBLE_T) {
      errors.push({ line: lineNo[i], message: `transmission ${tLabel(r)} is above 150 %, which is not a plausible reading` });
    } else if (t < 0) {
      t = 0;
      clamped++;
    }
    x[i] = w;
    y[i] = t;
    if (errors.length >= MAX_DETAILS) break;
  }
  if (errors.length > 0) fail(errors);
  if (clamped > 0) warnings.push(`${clamped} slightly negative transmission value(s), within instrument noise, were set to 0.`);

  const c = sortAndCollapse(x, y, lineNo);
  if (c.conflicts.length > 0) {
    fail(
      c.conflicts.slice(0, MAX_DETAILS).map(([a, b]) => ({
        line: b,
        message: `wavelength repeats line ${a} with a different transmission (lines ${a} and ${b})`,
      })),
    );
  }
  if (c.reordered === 'descending') warnings.push('Wavelengths were descending and have been put in ascending order.');
  if (c.reordered === 'sorted') warnings.push('Wavelengths were out of order and have been sorted.');
  if (c.collapsed > 0) warnings.push(`${c.collapsed} exactly repeated row(s) were merged.`);
  if (c.x.length < MIN_POINTS) {
    fail([{ line: lineNo[n - 1] ?? dataStart + 1, message: `only ${c.x.length} distinct wavelength(s); a curve needs at least ${MIN_POINTS}` }]);
  }

  return {
    points: { wavelengthNm: toArray(c.x), transmission: toArray(c.y) },
    assumed: {
      wavelengthUnit,
      transmissionUnit,
      delimiter,
      decimalSeparator: decimal,
      headerLines: dataStart,
      wavelengthColumn: wc,
      transmissionColumn: tc,
      columns: header.names,
    },
    rowCount: n,
    warnings,
  };
}
