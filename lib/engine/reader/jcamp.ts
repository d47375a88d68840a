/**
 * JCAMP-DX input (McDonald & Wilks 1988, Appl. Spectrosc. 42:151; the IUPAC
 * format many spectrophotometers export), parsed by the jcampconverter
 * package, including the compressed (X++(Y..Y)) forms (SQZ, DIF, DUP) and the
 * X and Y factors.
 *
 * The parser is a library's, so the text is made safe for it first, in one
 * linear pass: runs of blanks collapse to one (the format gives them no
 * meaning, and long runs would cost some of its patterns quadratic time),
 * lines are capped at MAX_JCAMP_LINE characters (the format's own limit is
 * 80), and the points the compressed data implies (DUP repeat counts) are
 * counted before any is made, so a tiny file cannot ask for a billion.
 * Tables of (X,Y) pairs (XYPOINTS, PEAK TABLE, XYDATA=(XY..XY)) are read here
 * by hand: they are plain numbers, and the library tells the two forms apart
 * with a pattern that costs quadratic time on such a table.
 */

import { convert } from 'jcampconverter';
import { MAX_ROWS } from './limits';
import { scanNumber } from './numbers';
import { fail, isSpace } from './text';
import type { ReadOptions, ReadResult, TransmissionUnit, WavelengthUnit } from './types';
import { checkedPoints } from './values';

const MAX_JCAMP_LINE = 256;
const DATA_LABELS = ['##XYDATA', '##XYPOINTS', '##PEAKTABLE', '##PEAK TABLE', '##DATATABLE', '##DATA TABLE'];

/** A JCAMP-DX file begins with "##TITLE=", the record the standard puts first. */
export function isJcamp(text: string): boolean {
  let i = 0;
  while (i < text.length && isSpace(text.charCodeAt(i))) i++;
  if (text.charCodeAt(i) !== 0x23 || text.charCodeAt(i + 1) !== 0x23) return false;
  const head = text.slice(i + 2, i + 12).toUpperCase();
  let j = 0;
  while (head[j] === ' ') j++;
  if (!head.startsWith('TITLE', j)) return false;
  j += 5;
  while (head[j] === ' ') j++;
  return head[j] === '=';
}

function collapse(line: string): string {
  let out = '';
  let from = 0;
  let i = 0;
  const n = line.length;
  while (i < n) {
    const c = line.charCodeAt(i);
    if (c === 32 || c === 9) {
      let j = i + 1;
      while (j < n && (line.charCodeAt(j) === 32 || line.charCodeAt(j) === 9)) j++;
      if (j - i > 1 || c === 9) {
        out += `${line.slice(from, i)} `;
        from = j;
      }
      i = j;
    } else i++;
  }
  return (out + line.slice(from)).trim();
}

/**
 * Upper bound of the values a data line makes: each value starts at a sign, an
 * SQZ or DIF letter, or a digit after a separator; a DUP (S–Z for 1–9, s for
 * 9, more digits continuing the count) repeats the value before it.
 */
function impliedValues(line: string): number {
  let values = 0;
  let inValue = false;
  let i = 0;
  while (i < line.length) {
    const c = line.charCodeAt(i);
    if ((c >= 83 && c <= 90) || c === 115) {
      let count = c === 115 ? 9 : c - 82;
      i++;
      while (i < line.length && line.charCodeAt(i) >= 48 && line.charCodeAt(i) <= 57 && count <= MAX_ROWS) {
        count = count * 10 + (line.charCodeAt(i) - 48);
        i++;
      }
      values += count - 1;
      inValue = false;
      continue;
    }
    const digit = (c >= 48 && c <= 57) || c === 46;
    const starts = (c >= 64 && c <= 82) || (c >= 97 && c <= 114) || c === 37 || c === 43 || c === 45;
    if (starts || (digit && !inValue)) values++;
    inValue = digit || starts;
    i++;
  }
  return values;
}

function unitOfX(u: string): WavelengthUnit | 'wavenumber' | null {
  const s = u.toUpperCase().replaceAll(' ', '');
  if (s.startsWith('NANOMET') || s === 'NM') return 'nm';
  if (s.startsWith('MICROMET') || s.startsWith('MICRON') || s === 'UM' || s === 'µM') return 'um';
  if (s.startsWith('ANGSTROM') || s === 'A' || s === 'Å') return 'angstrom';
  if (s === '1/CM' || s === 'CM-1' || s === 'CM^-1' || s.startsWith('WAVENUMBER')) return 'wavenumber';
  return null;
}

function unitOfY(u: string): TransmissionUnit | 'other' | null {
  const s = u.toUpperCase();
  if (s.includes('%') || s.includes('PERCENT')) return 'percent';
  if (s.includes('ABSORBANCE') || s.includes('OPTICAL DENSITY')) return 'od';
  if (s.includes('TRANSMIT') || s.includes('TRANSMISSION')) return 'fraction';
  if (s.includes('REFLECT') || s.includes('COUNT') || s.includes('KUBELKA')) return 'other';
  return null;
}

export function readJcamp(lines: string[], options: ReadOptions): ReadResult {
  const warnings: string[] = [];
  const safe: string[] = new Array(lines.length);
  const dataLines: number[] = [];
  const endLines: number[] = [];
  let points = 0;
  let inData = false;
  for (let i = 0; i < lines.length; i++) {
    const line = collapse(lines[i]);
    if (line.length > MAX_JCAMP_LINE) {
      fail([{ line: i + 1, message: `a JCAMP-DX line of ${line.length.toLocaleString('en-US')} characters; the format allows 80 (at most ${MAX_JCAMP_LINE} are read)` }]);
    }
    safe[i] = line;
    if (line.startsWith('##')) {
      const label = line.slice(0, 14).toUpperCase();
      inData = DATA_LABELS.some((l) => label.startsWith(l));
      if (inData) dataLines.push(i);
      if (label.startsWith('##END=')) endLines.push(i);
    } else if (inData) {
      points += impliedValues(line);
      // X and Y values, an X at each line start, and room for exponents read as letters
      if (points > 4 * MAX_ROWS) {
        fail([{ line: i + 1, message: `the data implies more than ${MAX_ROWS.toLocaleString('en-US')} points` }], 413);
      }
    }
  }
  const pairTables = dataLines.filter((i) => !safe[i].includes('++'));
  if (pairTables.length > 0) {
    if (pairTables.length !== dataLines.length) {
      fail([{ line: pairTables[0] + 1, message: 'tables of (X,Y) pairs and (X++(Y..Y)) rows in one file are not read together; export one form' }]);
    }
    return finish(readPairTables(safe, dataLines), lines, dataLines, endLines, options, warnings);
  }
  let result;
  try {
    result = convert(safe.join('\n'), { keepRecordsRegExp: /^$/ });
  } catch (e) {
    fail([{ line: dataLines[0] !== undefined ? dataLines[0] + 1 : 1, message: `not a readable JCAMP-DX file (${(e as Error).message.slice(0, 80)})` }]);
  }
  const entries: Spectrum[] = result.flatten
    .filter((e) => (e.spectra?.[0]?.data?.x?.length ?? 0) > 0)
    .map((e) => ({ title: e.title ?? '', x: e.spectra[0].data.x, y: e.spectra[0].data.y ?? [], xUnits: String(e.spectra[0].xUnits ?? ''), yUnits: String(e.spectra[0].yUnits ?? '') }));
  return finish(entries, lines, dataLines, endLines, options, warnings);
}

interface Spectrum {
  title: string;
  x: number[];
  y: number[];
  xUnits: string;
  yUnits: string;
}

/** Blocks of (X,Y) pairs, scaled by the block's XFACTOR and YFACTOR. */
function readPairTables(safe: string[], dataLines: number[]): Spectrum[] {
  const out: Spectrum[] = [];
  let title = '';
  let xUnits = '';
  let yUnits = '';
  let xFactor = 1;
  let yFactor = 1;
  for (const start of dataLines) {
    // the labels of this block: the nearest ones above its table
    for (let i = start - 1; i >= 0 && !(out.length > 0 && dataLines.includes(i)); i--) {
      const l = safe[i];
      if (!l.startsWith('##')) continue;
      const eq = l.indexOf('=');
      if (eq < 0) continue;
      const label = l.slice(2, eq).replaceAll(' ', '').replaceAll('_', '').replaceAll('-', '').toUpperCase();
      const value = l.slice(eq + 1).trim();
      if (label === 'TITLE' && !title) title = value;
      else if (label === 'XUNITS' && !xUnits) xUnits = value;
      else if (label === 'YUNITS' && !yUnits) yUnits = value;
      else if (label === 'XFACTOR' && xFactor === 1) xFactor = Number(value) || 1;
      else if (label === 'YFACTOR' && yFactor === 1) yFactor = Number(value) || 1;
      if (label === 'TITLE') break;
    }
    const x: number[] = [];
    const y: number[] = [];
    for (let i = start + 1; i < safe.length && !safe[i].startsWith('##'); i++) {
      const fields = splitPairFields(safe[i]);
      if (fields.length % 2 !== 0) fail([{ line: i + 1, message: 'an (X,Y) table line must hold whole pairs of numbers' }]);
      for (let k = 0; k < fields.length; k += 2) {
        const xv = scanNumber(fields[k]);
        const yv = scanNumber(fields[k + 1]);
        if (Number.isNaN(xv) || Number.isNaN(yv)) {
          fail([{ line: i + 1, message: `"${(Number.isNaN(xv) ? fields[k] : fields[k + 1]).slice(0, 40)}" is not a readable number` }]);
        }
        x.push(xv * xFactor);
        y.push(yv * yFactor);
      }
    }
    out.push({ title, x, y, xUnits, yUnits });
    title = '';
    xUnits = '';
    yUnits = '';
    xFactor = 1;
    yFactor = 1;
  }
  return out;
}

/** Numbers of an (X,Y) table line, parted by commas, semicolons or blanks; "$$" starts a comment. */
function splitPairFields(line: string): string[] {
  const out: string[] = [];
  let from = -1;
  for (let i = 0; i <= line.length; i++) {
    const c = i < line.length ? line.charCodeAt(i) : 32;
    if (c === 36 && line.charCodeAt(i + 1) === 36) {
      if (from >= 0) out.push(line.slice(from, i));
      return out;
    }
    const sep = c === 44 || c === 59 || c === 32 || c === 9;
    if (sep) {
      if (from >= 0) out.push(line.slice(from, i));
      from = -1;
    } else if (from < 0) from = i;
  }
  return out;
}

function finish(entries: Spectrum[], lines: string[], dataLines: number[], endLines: number[], options: ReadOptions, warnings: string[]): ReadResult {
  if (entries.length === 0) {
    fail([{ line: dataLines[0] !== undefined ? dataLines[0] + 1 : 1, message: 'the JCAMP-DX file holds no points (no XYDATA, XYPOINTS or PEAK TABLE with values)' }]);
  }
  const block = options.block ?? 1;
  if (block > entries.length) {
    fail([{ line: 1, message: `block ${block} does not exist; the file holds ${entries.length} spectr${entries.length > 1 ? 'a' : 'um'}` }]);
  }
  const entry = entries[block - 1];
  const xs = entry.x;
  const ys = entry.y;
  const dataLine = (dataLines[block - 1] ?? dataLines[0] ?? 0) + 1;
  if (xs.length > MAX_ROWS) fail([{ line: dataLine, message: `more than ${MAX_ROWS} points` }], 413);

  const { xUnits, yUnits } = entry;
  const xu = unitOfX(xUnits);
  const yu = unitOfY(yUnits);
  if (yu === 'other' && !options.transmissionUnit) {
    fail([{ line: dataLine, message: `the spectrum holds ${yUnits}, not transmission or absorbance` }]);
  }
  const n = Math.min(xs.length, ys.length);
  const wlRaw = new Float64Array(n);
  const tRaw = new Float64Array(n);
  const lineNo = new Int32Array(n).fill(dataLine + 1);
  let tMax = -Infinity;
  let xMin = Infinity;
  let xMax = -Infinity;
  for (let i = 0; i < n; i++) {
    // 1/cm to nm: λ = 10⁷ / ν̃
    wlRaw[i] = xu === 'wavenumber' && !options.wavelengthUnit ? 1e7 / xs[i] : xs[i];
    tRaw[i] = ys[i];
    if (ys[i] > tMax) tMax = ys[i];
    if (wlRaw[i] < xMin) xMin = wlRaw[i];
    if (wlRaw[i] > xMax) xMax = wlRaw[i];
  }
  if (xu === 'wavenumber' && !options.wavelengthUnit) warnings.push(`Wavenumbers (${xUnits}) were turned into wavelengths, λ = 10⁷ / ν̃.`);
  let wavelengthUnit: WavelengthUnit = options.wavelengthUnit ?? (xu === 'wavenumber' || xu === null ? 'nm' : xu);
  if (!options.wavelengthUnit && xu === null) {
    wavelengthUnit = xMin > 0 && xMax <= 5 ? 'um' : xMin >= 1000 && xMax > 3000 ? 'angstrom' : 'nm';
    warnings.push(`The X unit "${xUnits}" is not a wavelength unit the reader knows; read as ${wavelengthUnit} from the values' size.`);
  }
  let transmissionUnit: TransmissionUnit = options.transmissionUnit ?? (yu === null || yu === 'other' ? 'fraction' : yu);
  if (!options.transmissionUnit && (yu === null || yu === 'fraction') && tMax > 1.5) {
    transmissionUnit = 'percent';
    warnings.push(`Transmission was read as percent because values reach ${tMax}.`);
  }
  const points2 = checkedPoints(wlRaw, tRaw, lineNo, n, wavelengthUnit, transmissionUnit, dataLine, warnings);
  const title = entry.title ?? '';
  warnings.unshift(`Read as JCAMP-DX${title ? ` (“${title.slice(0, 60)}”)` : ''}: ${n} points from the table at line ${dataLine}.`);
  const end = endLines.find((e) => e >= dataLine - 1) ?? lines.length - 1;
  return {
    points: points2,
    assumed: {
      format: 'jcamp-dx',
      wavelengthUnit,
      transmissionUnit,
      delimiter: 'whitespace',
      decimalSeparator: '.',
      headerLines: dataLine,
      footerLines: Math.max(0, lines.length - 1 - end),
      block,
      blocks: entries.length,
      wavelengthColumn: 0,
      transmissionColumn: 1,
      columns: [`X (${xUnits || 'no unit'})`, `Y (${yUnits || 'no unit'})`],
      pairs: 0,
      pair: 0,
      pairAngles: [],
      skipped: [],
    },
    rowCount: n,
    warnings,
  };
}
