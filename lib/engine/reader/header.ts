/**
 * The header: column names from the text rows above the data, and what those
 * names say about each column (wavelength or transmission, and its unit).
 * Header text is searched with indexOf, not patterns, so its cost is linear.
 */

import type { Layout } from './detect';
import { splitLine } from './fields';
import { isDigit } from './numbers';
import { isSkippable, isSpace } from './text';
import type { Delimiter, TransmissionUnit, WavelengthUnit } from './types';

export interface HeaderInfo {
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

export function isWavelengthHint(h: string): boolean {
  return hasPart(h, ['wave', 'lambda', 'λ']) || hasWord(h, ['wl', 'nm', 'um', 'µm', 'μm', 'å', 'angstrom', 'angstroms', 'ångström', 'ångströms', 'micron', 'microns']);
}

export function isTransmissionHint(h: string): boolean {
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
export function readHeader(lines: string[], dataStart: number, layout: Layout, ncols: number): HeaderInfo {
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

export function wavelengthUnitFromHeader(h: string): WavelengthUnit | null {
  if (hasWord(h, ['um', 'µm', 'μm', 'micron', 'microns', 'micrometer', 'micrometers', 'micrometre', 'micrometres'])) return 'um';
  if (hasWord(h, ['a', 'å']) || hasPart(h, ['ångström', 'angstrom'])) return 'angstrom';
  if (hasWord(h, ['nm']) || h.includes('nanomet')) return 'nm';
  return null;
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

export function transmissionUnitFromHeader(h: string): TransmissionUnit | null {
  if (hasPart(h, ['%', 'percent']) || hasWord(h, ['pct'])) return 'percent';
  if (hasWord(h, ['od', 'o.d.', 'abs']) || hasPart(h, ['optical density', 'absorbance'])) return 'od';
  if (h.includes('fraction') || hasZeroToOne(h)) return 'fraction';
  return null;
}
