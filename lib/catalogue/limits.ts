/**
 * The ranges of the catalogue's number parameters, with the words a message uses: read by the search
 * schema (search-params.ts) and by the readers of typed numbers (quantities.ts), so a field, a word in the
 * search box and the API refuse the same values with the same sentence.
 * The ranges the engine and the request schemas share come from lib/engine/limits.ts.
 */
import { REQUEST_LIMITS as L } from '@/lib/engine/limits';

export interface NumberLimit {
  min: number;
  max: number;
  /** Name in a message. */
  label: string;
  /** Forms the reader accepts, for a message. */
  example: string;
  /** After the range in a message: its unit. */
  unit: string;
}

const nm = (label: string, min: number, max: number): NumberLimit => ({ min, max, label, example: '5, 5 nm or 50 Å', unit: ' nm' });
const deg = (label: string, min: number, max: number): NumberLimit => ({ min, max, label, example: '8 or 8°', unit: '°' });

export const NUMBER_LIMITS = {
  cwlMin: nm('CWL from', 100, 3000),
  cwlMax: nm('CWL to', 100, 3000),
  fwhmMin: nm('FWHM from', 0, 500),
  fwhmMax: nm('FWHM to', 0, 500),
  peakMin: { min: 0, max: 1, label: 'Peak transmission', example: '80 %', unit: ' (a fraction: 0.8 is 80 %)' },
  aoiMin: deg('Measured AOI from', ...L.measuredAoiDeg),
  aoiMax: deg('Measured AOI to', ...L.measuredAoiDeg),
  fNumber: { min: L.fNumber[0], max: L.fNumber[1], label: 'f-number', example: '2, f/2 or F2.8', unit: '' },
  obstruction: { min: 0, max: 0.9, label: 'Obstruction', example: '0.4, 40 or 40 %', unit: ' (a diameter ratio: 0.4 is 40 %)' },
  nEff: { min: L.nEff[0], max: L.nEff[1], label: 'Effective index', example: '2.05', unit: '' },
  fieldAngleDeg: deg('Field angle', ...L.fieldAngleDeg),
  minThroughput: { min: 0, max: 1, label: 'Line throughput', example: '80 %', unit: ' (a fraction: 0.8 is 80 %)' },
} satisfies Record<string, NumberLimit>;

export type LimitedParam = keyof typeof NUMBER_LIMITS;
