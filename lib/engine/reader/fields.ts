/**
 * Splitting a row into fields at a delimiter (or runs of whitespace), never
 * more than MAX_COLUMNS + 1 of them, so a row's cost stays bounded.
 */

import Papa from 'papaparse';
import type { LineDetail } from '../errors';
import { MAX_COLUMNS } from './limits';
import { isSpace } from './text';
import type { Delimiter } from './types';

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
export function splitLine(line: string, delimiter: Delimiter, limit = MAX_COLUMNS + 1): string[] {
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

export function tooManyColumns(line: number): LineDetail {
  return { line, message: `the row has more than ${MAX_COLUMNS} columns; a curve file may have at most ${MAX_COLUMNS}` };
}
