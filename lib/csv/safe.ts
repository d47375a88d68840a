/**
 * The one rule for every CSV file Bandcone writes (single-curve download, bulk
 * export, chart and study tables), so a text someone typed never runs as a
 * spreadsheet formula.
 *
 * The file is judged the way a spreadsheet reads it, not the way our reader
 * does: a line is split at every separator, and a quote counts only when it
 * opens a field. Comma is our separator, but a spreadsheet set to a
 * semicolon locale splits at `;` too, so both count. A cell runs as a formula
 * when it begins with = + - @ (or their full-width forms), also behind leading
 * whitespace that some programs trim, or with a tab or carriage return (OWASP
 * "CSV Injection", common practice). The strictest rule follows:
 *
 *   1. control characters (tab, CR, LF, …) in text become spaces, so a text
 *      stays on its line and cannot hide a formula behind a tab;
 *   2. a text whose first non-space character is a formula character gets a
 *      leading apostrophe (shown as text by every spreadsheet);
 *   3. inside a text, whatever follows a separator is treated as the start of
 *      a cell as well: when it begins (after spaces) with a formula character
 *      or a quote, an apostrophe goes right after the separator. In a comment
 *      line, written unquoted, both `,` and `;` count, so `# contributor:
 *      x,=HYPERLINK(…)` has no cell that starts a formula or opens a quoted
 *      field. In a data cell only `;` counts: a cell holding a comma is
 *      quoted, and a quoted field keeps its commas in either reading;
 *   4. numbers are data and stay numbers (a negative value keeps its sign).
 *
 * Quoting of a data cell is papaparse's `unparse` (RFC 4180), with its
 * `escapeFormulae` given the rule-2 pattern, as a second guard.
 *
 * Every scan is a single pass over the text: no regular expression backtracks
 * on user text.
 */

import Papa from 'papaparse';

export type CsvCell = string | number | null | undefined;

/** RFC 4180 line ends, which every spreadsheet accepts. */
export const CSV_EOL = '\r\n';

const FORMULA_CHARS = new Set(['=', '+', '-', '@', '\uFF1D', '\uFF0B', '\uFF0D', '\uFF20']);
const LINE_SEPARATORS = new Set([',', ';']);
const CELL_SEPARATORS = new Set([';']);

function isControl(code: number): boolean {
  return code < 0x20 || code === 0x7f || (code >= 0x80 && code < 0xa0) || code === 0x2028 || code === 0x2029;
}

function isSpace(ch: string): boolean {
  return ch === ' ' || ch === '\u00a0' || ch === '\u3000' || (ch >= '\u2000' && ch <= '\u200b') || ch === '\ufeff';
}

/** First index at or after `from` that is not a space. */
function skipSpaces(s: string, from: number): number {
  let i = from;
  while (i < s.length && isSpace(s[i])) i++;
  return i;
}

/** Rule 1: one line of text with no control characters. */
export function oneLineText(text: string): string {
  let out = '';
  let last = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (!isControl(c)) continue;
    out += text.slice(last, i) + ' ';
    if (c === 0x0d && text.charCodeAt(i + 1) === 0x0a) i++;
    last = i + 1;
  }
  return last === 0 ? text : out + text.slice(last);
}

/** True when a spreadsheet would read `text`, as the start of a cell, as a formula. */
export function startsFormula(text: string): boolean {
  if (text.length && isControl(text.charCodeAt(0))) return true;
  let i = 0;
  while (i < text.length && (isSpace(text[i]) || isControl(text.charCodeAt(i)))) i++;
  return i < text.length && FORMULA_CHARS.has(text[i]);
}

/**
 * Rules 1–3: text that is safe however a spreadsheet splits it. `inside` says where the
 * text goes: a quoted-when-needed data cell, or the bare text of a comment line.
 */
export function inertText(text: string, inside: 'cell' | 'line' = 'cell'): string {
  const separators = inside === 'line' ? LINE_SEPARATORS : CELL_SEPARATORS;
  const s = oneLineText(text);
  let out = startsFormula(s) ? "'" : '';
  let last = 0;
  for (let i = 0; i < s.length; i++) {
    if (!separators.has(s[i])) continue;
    const j = skipSpaces(s, i + 1);
    if (j < s.length && (FORMULA_CHARS.has(s[j]) || s[j] === '"')) {
      out += s.slice(last, i + 1) + "'";
      last = i + 1;
    }
  }
  return out + s.slice(last);
}

/** A `#` comment line: the whole text is inert, so every cell a spreadsheet cuts from it is safe. */
export function commentLine(text: string): string {
  return `# ${inertText(text, 'line')}`;
}

/**
 * Numbers print at up to 12 significant digits when asked (float noise such as
 * 87.40000000000001 stays out of chart tables); otherwise the shortest text that
 * reads back to the same double.
 */
export function csvNumber(value: number, digits?: number): number | null {
  if (!Number.isFinite(value)) return null;
  const n = digits ? Number(value.toPrecision(digits)) : value;
  return Object.is(n, -0) ? 0 : n;
}

// Rule 2 again, for papaparse: only text reaches it (numbers are passed as numbers).
const ESCAPE_FORMULAE = /^[\s\u0000-\u001f]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]/;

/** Rows of cells as CSV text (RFC 4180 quoting), each text cell made inert first. */
export function csvRows(rows: readonly (readonly CsvCell[])[], opts: { digits?: number; eol?: string } = {}): string {
  if (rows.length === 0) return '';
  const data = rows.map((row) =>
    row.map((cell) => {
      if (cell == null) return null;
      if (typeof cell === 'number') return csvNumber(cell, opts.digits);
      return inertText(cell);
    }),
  );
  const eol = opts.eol ?? CSV_EOL;
  return Papa.unparse(data, { delimiter: ',', newline: eol, quoteChar: '"', escapeFormulae: ESCAPE_FORMULAE, header: false }) + eol;
}

/** One row (no line end). */
export function csvRow(cells: readonly CsvCell[], opts: { digits?: number } = {}): string {
  return csvRows([cells], { ...opts, eol: '\n' }).slice(0, -1);
}
