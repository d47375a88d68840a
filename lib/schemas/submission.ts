import { z } from './zod';
import { readerOptionsSchema } from './model';
import { COATINGS } from '@/lib/engine/temperature';
import { LINE_IDS } from '@/lib/engine/lines';
import { INSTRUMENTS, REQUEST_LIMITS } from '@/lib/engine/limits';
import { BEAMS, POLARIZATIONS, LICENCES, DECISIONS } from '@/lib/labels';

export { LINE_IDS, INSTRUMENTS };

const [, MAX_AOI] = REQUEST_LIMITS.measuredAoiDeg;
const aoi = () => z.number({ error: 'AOI must be a number' }).min(0, 'AOI cannot be negative').max(MAX_AOI, `AOI above ${MAX_AOI}° is outside what we model`);

const positive = (what: string) => z.number({ error: `${what} must be a number` }).positive(`${what} must be above 0`);
const optionalText = (max: number) => z.string().trim().max(max).optional().transform((v) => (v ? v : undefined));

// One schema for the upload form and the route handler (docs/api.md; POST /api/submissions in /api/openapi.json).
export const methodSchema = z
  .object({
    instrument: z.enum(INSTRUMENTS, { error: 'Choose the instrument kind' }),
    resolutionNm: positive('Resolution').max(50, 'Resolution above 50 nm cannot resolve a narrowband filter'),
    beam: z.enum(BEAMS, { error: 'Say whether the beam was collimated or converging' }),
    beamFNumber: z.number().min(0.5).max(100).optional(),
    aoiDeg: aoi(),
    temperatureC: z.number().min(-60).max(80).optional(),
    polarization: z.enum(POLARIZATIONS).optional(),
    // hard (sputtered), soft (evaporated) or unknown: sets the default temperature coefficient
    coating: z.enum(COATINGS, { error: 'coating must be hard, soft or unknown' }).optional(),
    // declared standard uncertainty of the wavelength scale; without it the quality check uses the instrument's default
    wavelengthUncertaintyNm: z.number().positive('The wavelength uncertainty must be above 0').max(REQUEST_LIMITS.wavelengthUncertaintyNm[1]).optional(),
    measuredOn: z.iso.date({ error: 'Use a date like 2026-03-14' }).optional(),
    lab: optionalText(200),
  })
  .refine((m) => m.beam !== 'converging' || m.beamFNumber !== undefined, {
    message: 'A converging beam needs its f-number: the cone itself shifts and widens the passband',
    path: ['beamFNumber'],
  });

export const submissionMetadataSchema = z.object({
  label: z.string().trim().min(3, 'Give the filter a label (maker and model as written on it)').max(200),
  maker: optionalText(120),
  lines: z.array(z.enum(LINE_IDS)).min(1, 'Pick at least one target line'),
  nominalCwlNm: positive('Nominal CWL').min(200).max(2500),
  nominalFwhmNm: positive('Nominal FWHM').max(200),
  declaredPreShiftNm: z.number().min(-10).max(20).optional(),
  serial: optionalText(100),
  sizeMm: optionalText(50),
  notes: optionalText(4000),
  licence: z.enum(LICENCES).default('CC-BY-4.0'),
  method: methodSchema,
  // `reader` carries the overrides the contributor chose in the live preview, so the stored curve is the one they saw.
  files: z.array(z.object({ name: z.string().min(1).max(255), aoiDeg: aoi(), reader: readerOptionsSchema.optional(),
    // a multi-temperature set: each file's own measurement temperature (dCWL/dT is fitted from them)
    temperatureC: z.number({ error: 'temperature must be a number of °C' }).min(-60, 'temperature below −60 °C is outside what we model').max(80, 'temperature above 80 °C is outside what we model').optional(),
    // a polarised set: each file's polarisation (s and p indices are fitted from them)
    polarization: z.enum(POLARIZATIONS, { error: 'polarization must be unpolarized, s or p' }).optional() })).max(20).optional(),
});

export type SubmissionMetadata = z.output<typeof submissionMetadataSchema>;
export type SubmissionMetadataInput = z.input<typeof submissionMetadataSchema>;

export const reviewDecisionSchema = z.object({
  decision: z.enum(DECISIONS, { error: 'decision must be verify, request_changes or reject' }),
  note: z.string().trim().max(4000).default(''),
}).refine((d) => d.decision === 'verify' || d.note.length > 0, { message: 'Say why in the note', path: ['note'] });

export const threadReplySchema = z.object({ body: z.string().trim().min(1, 'Write something').max(4000) });

// The live preview runs the checks on whatever the form holds so far: every field optional, a bad one dropped rather than refused.
const loose = <T extends z.ZodType>(t: T) => t.optional().catch(undefined);
export const previewMetadataSchema = z.object({
  lines: loose(z.array(z.string())),
  nominalCwlNm: loose(z.number().positive()),
  nominalFwhmNm: loose(z.number().positive()),
  declaredPreShiftNm: loose(z.number()),
  method: loose(
    z.object({
      instrument: loose(z.string()),
      resolutionNm: loose(z.number().positive()),
      beam: loose(z.enum(BEAMS)),
      beamFNumber: loose(z.number().positive()),
      aoiDeg: loose(z.number().min(0).max(MAX_AOI)),
      temperatureC: loose(z.number()),
    }),
  ),
});
