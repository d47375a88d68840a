/**
 * Turns an uploaded data file into a clean curve (docs/model.md §Curve) and says
 * what it assumed. Lab files come in every layout, so the reader guesses
 * delimiter, decimal mark, header block, columns and units, and lets the caller
 * override each guess. Every refusal names the line of the original file.
 *
 * Anyone may upload, so every step is linear in the size of the file: numbers
 * and fields are scanned by hand (no regular expression runs on user text),
 * rows have at most MAX_COLUMNS fields, a number at most MAX_NUMBER_CHARS
 * characters, and the layout is sniffed on a bounded prefix.
 *
 * The parts: text.ts (decoding, lines), detect.ts (layout, and the blocks of
 * data between header and footer), header.ts (column names and what they
 * say), fields.ts and columns.ts (splitting rows, choosing the two columns or
 * a column pair), numbers.ts (number scanning), values.ts (units and value
 * checks), jcamp.ts (JCAMP-DX files). This module runs them in order.
 */

import { MAX_PLAUSIBLE_T } from '../curve';
import { CurveReadError, EngineInputError, type LineDetail } from '../errors';
import { chooseColumns } from './columns';
import { chooseBlock, dataBlocks, findBlocks, firstContentLine, firstOverlongNumber, lastContentLine, skippedLines, sniffLayout } from './detect';
import { splitLine, tooManyColumns } from './fields';
import { readHeader, transmissionUnitFromHeader, wavelengthUnitFromHeader } from './header';
import { MAX_COLUMNS, MAX_NUMBER_CHARS, MAX_ROWS } from './limits';
import { hasDigit, overlongMessage, parseNumber } from './numbers';
import { MAX_DETAILS, checkPrintable, decode, fail, isBlank, isSkippable, splitLines } from './text';
import { checkedPoints } from './values';
import { isJcamp, readJcamp } from './jcamp';
import type { ReadOptions, ReadResult, WavelengthUnit } from './types';

export { MAX_COLUMNS, MAX_FILE_BYTES, MAX_LINES, MAX_NUMBER_CHARS, MAX_ROWS } from './limits';
export { scanNumber } from './numbers';
export type { DecimalSeparator, Delimiter, ReadAssumptions, ReadOptions, ReadResult, TransmissionUnit, WavelengthUnit } from './types';

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
  if (o.footerLines !== undefined && (!Number.isInteger(o.footerLines) || o.footerLines < 0 || (o.headerLines ?? 0) + o.footerLines > lineCount)) {
    bad('footerLines', 'footerLines must be a whole number; header and footer lines together cannot exceed the number of lines');
  }
  if (o.block !== undefined && (!Number.isInteger(o.block) || o.block < 1)) bad('block', 'block must be a whole number from 1');
  if (o.pair !== undefined && (!Number.isInteger(o.pair) || o.pair < 1 || 2 * o.pair > MAX_COLUMNS)) bad('pair', `pair must be a whole number from 1 to ${MAX_COLUMNS / 2}`);
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

export function readCurveText(input: string | Uint8Array, options: ReadOptions = {}): ReadResult {
  const text = decode(input);
  checkPrintable(text);
  const lines = splitLines(text);
  if (lines.length > 0 && lines[lines.length - 1] === '') lines.pop();
  validateOptions(options, lines.length);
  if (isJcamp(text)) return readJcamp(lines, options);
  const warnings: string[] = [];

  const from = options.headerLines ?? 0;
  const to = lines.length - (options.footerLines ?? 0);
  const layout = sniffLayout(lines, from, options);

  const blocks = dataBlocks(findBlocks(lines, from, to, layout));
  if (blocks.length === 0) {
    const overlong = firstOverlongNumber(lines, from, layout.delimiter);
    if (overlong) fail([overlong]);
    const single = lines.findIndex((l) => !isSkippable(l) && !Number.isNaN(parseNumber(l, layout.decimal)));
    if (single >= 0) {
      fail([{ line: single + 1, message: 'only one column of numbers was found; a curve needs a wavelength column and a transmission column' }]);
    }
    fail([{ line: 1, message: 'no rows of numbers were found in this file' }]);
  }
  if (options.block !== undefined && options.block > blocks.length) {
    fail([{ line: blocks[blocks.length - 1].start + 1, message: `block ${options.block} does not exist; the file holds ${blocks.length} block${blocks.length > 1 ? 's' : ''} of data` }]);
  }
  const chosen = chooseBlock(blocks, options);
  const blockIndex = blocks.indexOf(chosen);
  // header and footer lines the caller set are exact: the data runs up to them
  let dataStart = chosen.start;
  let dataEnd = chosen.end;
  if (options.headerLines !== undefined && blockIndex === 0) dataStart = firstContentLine(lines, from, to);
  if (options.footerLines !== undefined && blockIndex === blocks.length - 1) dataEnd = lastContentLine(lines, from, to);

  const ncols = chosen.width;
  if (ncols > MAX_COLUMNS) fail([tooManyColumns(chosen.start + 1)]);
  if (ncols < 2) {
    fail([{ line: dataStart + 1, message: 'only one column of numbers was found; a curve needs a wavelength column and a transmission column' }]);
  }
  for (const f of ['wavelengthColumn', 'transmissionColumn'] as const) {
    const v = options[f];
    if (v !== undefined && v >= ncols) {
      fail([{ line: dataStart + 1, message: `${f} ${v} does not exist; the data rows have ${ncols} columns (0 to ${ncols - 1})` }]);
    }
  }
  const skipped = skippedLines(lines, dataStart, dataEnd, blocks, chosen);
  for (const k of skipped) {
    if (k.what === 'header') continue;
    const where = k.from === k.to ? `Line ${k.from}` : `Lines ${k.from}–${k.to}`;
    warnings.push(
      k.what === 'footer'
        ? `${where} after the data (“${k.text}”) were left out as a footer; set the trailing lines to ignore if that is wrong.`
        : `${where} hold another block of data (“${k.text}”), left out; choose the block to read if that is wrong.`,
    );
  }

  const header = readHeader(lines, dataStart, layout, ncols);
  if (options.pair !== undefined && 2 * options.pair > ncols) {
    fail([{ line: dataStart + 1, message: `column pair ${options.pair} does not exist; the data rows have ${ncols} columns (${Math.floor(ncols / 2)} pairs)` }]);
  }
  const { wc, tc, pairs, pair, pairAngles } = chooseColumns(lines, dataStart, dataEnd, layout, ncols, header, options);
  if (tc === undefined || tc === wc) {
    fail([{ line: dataStart + 1, message: 'no transmission column could be told apart from the wavelength column' }]);
  }
  const readingPair = pair > 0;
  if (pairs >= 2) {
    const angles = pairAngles.every((a) => a !== null) ? ` (at ${pairAngles.map((a) => `${a}°`).join(', ')})` : '';
    warnings.push(
      `The file holds ${pairs} pairs of columns side by side${angles}; pair ${pair || '–'} (“${header.names[wc]}”, “${header.names[tc]}”) was read. Choose another pair, or read each pair as one curve of a set.`,
    );
  } else if (ncols > 2 && (options.wavelengthColumn === undefined || options.transmissionColumn === undefined)) {
    warnings.push(`The file has ${ncols} columns; "${header.names[wc]}" was read as wavelength and "${header.names[tc]}" as transmission.`);
  }

  // read every data row into typed arrays (a 200 000-row file must parse in well under a second)
  const errors: LineDetail[] = [];
  const cap = Math.max(0, Math.min(dataEnd + 1 - dataStart, MAX_ROWS));
  const wlRaw = new Float64Array(cap);
  const tRaw = new Float64Array(cap);
  const lineNo = new Int32Array(cap);
  let n = 0;
  const { delimiter, decimal } = layout;
  const plain = delimiter !== 'whitespace' && decimal === '.';
  const need = Math.max(wc, tc);
  for (let i = dataStart; i <= dataEnd; i++) {
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
    // a shorter scan in a pair of columns is padded with blank fields
    if (readingPair && seen > need && isBlank(fw) && isBlank(ft)) continue;
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

  const points = checkedPoints(wlRaw, tRaw, lineNo, n, wavelengthUnit, transmissionUnit, dataStart + 1, warnings);

  return {
    points,
    assumed: {
      format: 'table',
      wavelengthUnit,
      transmissionUnit,
      delimiter,
      decimalSeparator: decimal,
      headerLines: dataStart,
      footerLines: lines.length - 1 - dataEnd,
      block: blockIndex + 1,
      blocks: blocks.length,
      wavelengthColumn: wc,
      transmissionColumn: tc,
      columns: header.names,
      pairs,
      pair,
      pairAngles,
      skipped,
    },
    rowCount: n,
    warnings,
  };
}
