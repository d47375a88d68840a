/**
 * The file as text: decoding bytes (UTF-8, UTF-16 with a BOM, Windows-1252),
 * refusing binary and oversized input, splitting lines, telling comments from
 * rows, and the line-numbered refusal every part of the reader throws.
 */

import { CurveReadError, type LineDetail } from '../errors';
import { MAX_FILE_BYTES, MAX_LINES } from './limits';

export const MAX_DETAILS = 20;

export function isSpace(c: number): boolean {
  return c <= 32 || c === 0xa0 || c === 0xfeff;
}

export function isBlank(f: string): boolean {
  for (let i = 0; i < f.length; i++) if (!isSpace(f.charCodeAt(i))) return false;
  return true;
}

/** Splits text at CRLF, CR or LF; more than MAX_LINES lines is refused (413). */
export function splitLines(text: string): string[] {
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
export function isSkippable(line: string): boolean {
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
export function decode(input: string | Uint8Array): string {
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

export function checkPrintable(text: string): void {
  const n = Math.min(text.length, 65536);
  if (n === 0) return;
  let bad = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0x0c) || c === 0x7f || c === 0xfffd) bad++;
  }
  if (bad > 0.1 * n) throw binaryError(1);
}

export function fail(details: LineDetail[], status: 422 | 413 = 422): never {
  const first = details[0];
  const more = details.length > 1 ? ` (and ${details.length - 1} more problem${details.length > 2 ? 's' : ''})` : '';
  throw new CurveReadError(`Line ${first.line}: ${first.message}${more}.`, details, status);
}
