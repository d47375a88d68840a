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
