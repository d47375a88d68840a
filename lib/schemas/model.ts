import { z } from './zod';
import { MAX_COLUMNS } from '@/lib/engine/reader/limits';
import { REQUEST_LIMITS as L } from '@/lib/engine/limits';

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);

export const pointsSchema = z
  .object({
    wavelengthNm: z.array(finite('wavelengthNm')).min(5, 'At least 5 points are needed').max(200_000, 'At most 200 000 points'),
    transmission: z.array(finite('transmission')).min(5, 'At least 5 points are needed').max(200_000, 'At most 200 000 points'),
  })
  .refine((p) => p.wavelengthNm.length === p.transmission.length, { message: 'wavelengthNm and transmission must have the same length' });

const nEffMessage = `nEff must be between ${L.nEff[0].toFixed(1)} and ${L.nEff[1].toFixed(1)}`;
export const nEffSchema = z.number({ error: 'nEff is required (typical 1.5–2.3)' }).min(L.nEff[0], nEffMessage).max(L.nEff[1], nEffMessage);
/** The s or p effective index of a polarised set, within the same limits, named in its message. */
const polarisedNEff = (pol: 's' | 'p') => {
  const message = `nEffPolarised.${pol} must be between ${L.nEff[0].toFixed(1)} and ${L.nEff[1].toFixed(1)}`;
  return z.number({ error: `nEffPolarised.${pol} must be a number` }).min(L.nEff[0], message).max(L.nEff[1], message);
};

export const opticSchema = z.object({
  fNumber: z.number({ error: 'optic.fNumber must be a number' }).min(L.fNumber[0], `f-number must be at least ${L.fNumber[0]}`).max(L.fNumber[1], `f-number must be at most ${L.fNumber[1]}`),
  obstruction: z.number({ error: 'optic.obstruction must be a number' }).min(0, 'obstruction cannot be negative').lt(1, 'obstruction must be below 1').default(0),
  fieldAngleDeg: z.number().min(L.fieldAngleDeg[0], 'field angle cannot be negative').max(L.fieldAngleDeg[1], `field angle must be at most ${L.fieldAngleDeg[1]}°`).optional(),
  mapping: z.enum(['tangent', 'sine']).optional(),
});

/** A typed sky: continuum per nm and line strengths by sky-line id (lib/engine/sky.ts). */
export const skyModelSchema = z.object({
  continuum: z.number({ error: 'sky.model.continuum must be a number' }).min(0, 'the continuum level cannot be negative').max(1e9, 'the continuum level is too large'),
  lines: z.record(z.string().max(20), z.number({ error: 'a sky-line strength must be a number' }).min(0, 'a sky-line strength cannot be negative').max(1e9, 'a sky-line strength is too large')).default({}),
});

export const skyRequestSchema = z.object({
  model: z.union([z.string({ error: 'sky.model is a model id or a typed model' }).max(40), skyModelSchema]),
  reference: z
    .union([
      z.object({ curveId: z.number({ error: 'sky.reference.curveId must be a curve id' }).int().positive() }).strict(),
      z.object({ boxFwhmNm: z.number({ error: 'sky.reference.boxFwhmNm must be a number of nm' }).positive('the box width must be above 0 nm').max(200, 'the box width must be at most 200 nm') }).strict(),
    ], { error: 'sky.reference is { curveId } or { boxFwhmNm }' })
    .optional(),
});

// docs/api.md, POST /api/model/cone.
export const coneRequestSchema = z
  .object({
    curveId: z.number().int().positive().optional(),
    points: pointsSchema.optional(),
    optic: opticSchema,
    nEff: nEffSchema,
    // a set measured in polarised light: the cone averages s and p with their own indices (docs/model.md §Polarised sets)
    nEffPolarised: z.object({ s: polarisedNEff('s'), p: polarisedNEff('p') }).strict().optional(),
    measuredAoiDeg: z.number().min(L.measuredAoiDeg[0]).max(L.measuredAoiDeg[1]).optional(),
    preShiftNm: z.number().min(L.preShiftNm[0]).max(L.preShiftNm[1]).optional(),
    tempCoeffNmPerC: z.number().min(L.tempCoeffNmPerC[0]).max(L.tempCoeffNmPerC[1]).optional(),
    tempC: z.number().min(-80).max(100).optional(),
    refTempC: z.number().min(-80).max(100).optional(),
    lines: z.array(z.string()).max(20).optional(),
    lineNm: z.number().positive().max(5000).optional(),
    radialVelocityKms: z.number().min(-30_000).max(30_000).optional(),
    includeCurve: z.boolean().optional(),
    z: z.number({ error: 'z must be a number' }).min(-0.1, 'z must be at least −0.1').max(1, 'z must be at most 1').optional(),
    doublets: z.boolean({ error: 'doublets must be true or false' }).optional(),
    lineWeights: z.record(z.string().max(40), z.number({ error: 'a line weight must be a number' }).min(0, 'a line weight cannot be negative').max(1e6, 'a line weight must be at most 1 000 000')).optional(),
    sky: skyRequestSchema.optional(),
    // error bars: the wavelength-scale uncertainty (nm) and the n_eff uncertainty; a stored curve supplies its own by default
    wavelengthUncertaintyNm: z.number().min(0).max(L.wavelengthUncertaintyNm[1], `wavelengthUncertaintyNm must be at most ${L.wavelengthUncertaintyNm[1]} nm`).optional(),
    nEffUncertainty: z.number().min(0).max(1, 'nEffUncertainty must be at most 1').optional(),
  })
  .refine((b) => (b.curveId === undefined) !== (b.points === undefined), { message: 'Send either curveId or points, not both and not neither', path: ['curveId'] })
  .refine((b) => b.z === undefined || b.radialVelocityKms === undefined, { message: 'Send either z or radialVelocityKms, not both', path: ['z'] });

export const neffRequestSchema = z
  .object({
    measurements: z.array(z.object({ aoiDeg: z.number().min(L.measuredAoiDeg[0]).max(L.measuredAoiDeg[1]), cwlNm: z.number().positive() })).min(2).max(200).optional(),
    curveIds: z.array(z.number().int().positive()).min(2).max(50).optional(),
  })
  .refine((b) => (b.measurements === undefined) !== (b.curveIds === undefined), { message: 'Send either measurements or curveIds' });

export const readerOptionsSchema = z
  .object({
    wavelengthUnit: z.enum(['nm', 'angstrom', 'um']).optional(),
    transmissionUnit: z.enum(['fraction', 'percent', 'od']).optional(),
    delimiter: z.enum([',', ';', '\t', 'whitespace']).optional(),
    decimalSeparator: z.enum(['.', ',']).optional(),
    headerLines: z.number().int().min(0).max(1000).optional(),
    footerLines: z.number().int().min(0).max(1000).optional(),
    block: z.number().int().min(1).max(1000).optional(),
    pair: z.number().int().min(1).max(MAX_COLUMNS / 2).optional(),
    wavelengthColumn: z.number().int().min(0).max(MAX_COLUMNS - 1, `Column indexes run from 0 to ${MAX_COLUMNS - 1}`).optional(),
    transmissionColumn: z.number().int().min(0).max(MAX_COLUMNS - 1, `Column indexes run from 0 to ${MAX_COLUMNS - 1}`).optional(),
  })
  .strict();
