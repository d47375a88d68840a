import { z } from 'zod';
import { findLine, LINES } from '@/lib/engine/lines';
import { REQUEST_LIMITS as L } from '@/lib/engine/limits';

const num = (what: string, min: number, max: number, unit = '') =>
  z.preprocess(
    (v) => (v === '' || v === undefined || v === null ? undefined : typeof v === 'string' ? Number(v.trim()) : v),
    z
      .number({ error: `${what} must be a number` })
      .refine(Number.isFinite, `${what} must be a finite number`)
      .refine((v) => v >= min && v <= max, `${what} must be between ${min} and ${max}${unit}`),
  );

/** GET /api/labels/odds: the query string, every value as text. */
export const oddsQuerySchema = z
  .object({
    label: z.preprocess((v) => (typeof v === 'string' ? v.trim() : v), z.string({ error: 'label is required: the filter label to look up' }).min(1, 'label is required: the filter label to look up').max(200, 'label must be at most 200 characters')),
    fNumber: num('fNumber', ...L.fNumber),
    obstruction: num('obstruction', 0, 0.9, ' (a diameter ratio)').optional(),
    minThroughput: num('minThroughput', 0, 1, ' (a fraction, 0.8 for 80 %)'),
    line: z
      .string({ error: 'line is required: a line id such as Ha, or a wavelength in nm' })
      .refine((v) => !!findLine(v) || (Number.isFinite(Number(v)) && Number(v) > 100 && Number(v) < 3000), `line must be one of ${LINES.map((l) => l.id).join(', ')} or a wavelength between 100 and 3000 nm`),
    nEff: num('nEff', ...L.nEff).optional(),
    fieldAngleDeg: num('fieldAngleDeg', ...L.fieldAngleDeg, '°').optional(),
    preShiftNm: num('preShiftNm', ...L.preShiftNm, ' nm').optional(),
  })
  .strict();

export type OddsQuery = z.output<typeof oddsQuerySchema>;

export function parseOddsQuery(sp: URLSearchParams): OddsQuery {
  const raw: Record<string, string> = {};
  sp.forEach((v, k) => (raw[k] = v));
  return oddsQuerySchema.parse(raw);
}
