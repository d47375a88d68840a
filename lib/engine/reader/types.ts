/** The reader's public types: what a caller may choose, and what the reader assumed. */

import type { CurvePoints } from '../types';

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
  /** Lines at the end of the file that are not data (a footer, a summary, a checksum). */
  footerLines?: number;
  /** Which block of data to read, 1-based in file order, when the file holds several (default: the largest). */
  block?: number;
  /** Which pair of (wavelength, transmission) columns to read, 1-based, when scans at several angles stand side by side. */
  pair?: number;
  /** 0-based column indexes. */
  wavelengthColumn?: number;
  transmissionColumn?: number;
}

export interface ReadAssumptions {
  /** A table of columns, or a JCAMP-DX file. */
  format: 'table' | 'jcamp-dx';
  wavelengthUnit: WavelengthUnit;
  transmissionUnit: TransmissionUnit;
  delimiter: Delimiter;
  decimalSeparator: DecimalSeparator;
  headerLines: number;
  footerLines: number;
  /** The block read (1-based) and how many blocks of data the file holds. */
  block: number;
  blocks: number;
  wavelengthColumn: number;
  transmissionColumn: number;
  columns: string[];
  /** Column pairs side by side (one scan per angle): how many, which one was read (0 when none), and each pair's angle when the header names it. */
  pairs: number;
  pair: number;
  pairAngles: (number | null)[];
  /** Stretches of the file left out of the curve (1-based lines, inclusive), with their first line of text. */
  skipped: SkippedLines[];
}

export interface SkippedLines {
  from: number;
  to: number;
  what: 'header' | 'footer' | 'other block';
  /** The first line of text in the stretch, cut to 60 characters. */
  text: string;
}

export interface ReadResult {
  points: CurvePoints;
  assumed: ReadAssumptions;
  /** Data rows read from the file, before repeats were merged. */
  rowCount: number;
  warnings: string[];
}
