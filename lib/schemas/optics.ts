import { z } from './zod';
import { REQUEST_LIMITS } from '@/lib/engine/limits';
import { DEG } from '@/lib/engine/angles';

/**
 * One schema for the optics form and the /api/optics handlers. An optic is typed
 * either from its hardware (aperture, focal length, obstruction diameter, reducer,
 * sensor and exit pupil) or from the numbers the model needs (f-number,
 * obstruction ratio, chief-ray angle); whichever numbers can be derived are, so
 * the stored f-number always agrees with the stored hardware.
 */

export const OPTIC_LIMITS = {
  fNumber: REQUEST_LIMITS.fNumber,
  obstruction: [0, 0.9],
  fieldAngleDeg: REQUEST_LIMITS.fieldAngleDeg,
  reducerFactor: [0.1, 5],
} as const;

/** Typed and derived values may differ by this much before a request is called inconsistent. */
const AGREEMENT = { fNumber: 0.02, obstruction: 0.02, fieldAngleDeg: 0.5 } as const;

// Forms hand over '' or NaN for an empty number field, and PATCH uses null to clear one.
const blankToUndefined = (v: unknown) => (v === '' || v === null || (typeof v === 'number' && Number.isNaN(v)) ? undefined : v);

function num(label: string, min: number, max: number, opts: { exclusiveMin?: boolean; unit?: string } = {}) {
  const unit = opts.unit ? ` ${opts.unit}` : '';
  let n = z.number({ error: `${label} must be a number` }).refine(Number.isFinite, `${label} must be a finite number`);
  n = opts.exclusiveMin
    ? n.refine((v) => v > min, `${label} must be above ${min}${unit}`)
    : n.refine((v) => v >= min, `${label} must be at least ${min}${unit}`);
  n = n.refine((v) => v <= max, `${label} must be at most ${max}${unit}`);
  return z.preprocess(blankToUndefined, n.optional());
}

export const opticRawShape = {
  name: z.string({ error: 'Name the optic' }).trim().min(1, 'Name the optic').max(120, 'Keep the name under 120 characters'),
  description: z.preprocess(blankToUndefined, z.string().trim().max(500, 'Keep the description under 500 characters').optional()),
  apertureMm: num('Aperture', 0, 20_000, { exclusiveMin: true, unit: 'mm' }),
  focalLengthMm: num('Focal length', 0, 200_000, { exclusiveMin: true, unit: 'mm' }),
  obstructionMm: num('Obstruction diameter', 0, 20_000, { unit: 'mm' }),
  reducerFactor: num('Reducer or corrector factor', OPTIC_LIMITS.reducerFactor[0], OPTIC_LIMITS.reducerFactor[1]),
  fNumber: num('f-number', OPTIC_LIMITS.fNumber[0], OPTIC_LIMITS.fNumber[1]),
  obstruction: num('Obstruction ratio', OPTIC_LIMITS.obstruction[0], OPTIC_LIMITS.obstruction[1]),
  fieldAngleDeg: num('Chief-ray angle', OPTIC_LIMITS.fieldAngleDeg[0], OPTIC_LIMITS.fieldAngleDeg[1], { unit: '°' }),
  sensorDiagonalMm: num('Sensor diagonal', 0, 200, { exclusiveMin: true, unit: 'mm' }),
  exitPupilDistanceMm: num('Exit-pupil distance', 0, 100_000, { exclusiveMin: true, unit: 'mm' }),
};

export type OpticRaw = {
  name?: string;
  description?: string;
  apertureMm?: number;
  focalLengthMm?: number;
  obstructionMm?: number;
  reducerFactor?: number;
  fNumber?: number;
  obstruction?: number;
  fieldAngleDeg?: number;
  sensorDiagonalMm?: number;
  exitPupilDistanceMm?: number;
};

export type DerivedFrom = { fNumber: boolean; obstruction: boolean; fieldAngleDeg: boolean };

export type OpticDerivation = {
  fNumber: number | null;
  obstruction: number;
  fieldAngleDeg: number;
  /** Effective focal length after the reducer or corrector, when the focal length is known. */
  workingFocalLengthMm: number | null;
  derived: DerivedFrom;
  problems: { field: keyof OpticRaw; message: string }[];
};

const given = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const fmt = (v: number, d = 2) => v.toFixed(d);

/**
 * The model's numbers from whatever was typed, with every inconsistency named by
 * field. Pure, so the form shows the same derived values live that the server stores.
 */
export function deriveOptic(raw: OpticRaw): OpticDerivation {
  const problems: OpticDerivation['problems'] = [];
  const derived: DerivedFrom = { fNumber: false, obstruction: false, fieldAngleDeg: false };
  const reducer = given(raw.reducerFactor) ? raw.reducerFactor : 1;

  // f-number: a reducer or corrector multiplies the focal length, and so the f-number.
  let fNumber: number | null = null;
  let workingFocalLengthMm: number | null = null;
  const hasAperture = given(raw.apertureMm) && raw.apertureMm > 0;
  const hasFocal = given(raw.focalLengthMm) && raw.focalLengthMm > 0;
  if (hasFocal) workingFocalLengthMm = raw.focalLengthMm! * reducer;
  if (hasAperture && hasFocal) {
    fNumber = workingFocalLengthMm! / raw.apertureMm!;
    derived.fNumber = true;
    const [lo, hi] = OPTIC_LIMITS.fNumber;
    const reducerText = reducer !== 1 ? ` × ${reducer} reducer` : '';
    if (fNumber < lo || fNumber > hi) {
      problems.push({
        field: 'fNumber',
        message: `Aperture ${raw.apertureMm} mm and focal length ${raw.focalLengthMm} mm${reducerText} give f/${fmt(fNumber)}; the f-number must be between ${lo} and ${hi}`,
      });
    } else if (given(raw.fNumber) && Math.abs(raw.fNumber - fNumber) > AGREEMENT.fNumber * fNumber) {
      problems.push({
        field: 'fNumber',
        message: `f/${raw.fNumber} disagrees with aperture ${raw.apertureMm} mm and focal length ${raw.focalLengthMm} mm${reducerText} (f/${fmt(fNumber)}); send the hardware or the f-number, not both`,
      });
    }
  } else if (hasAperture !== hasFocal && !given(raw.fNumber)) {
    problems.push(
      hasAperture
        ? { field: 'focalLengthMm', message: 'Give the focal length too, or type the f-number directly' }
        : { field: 'apertureMm', message: 'Give the aperture too, or type the f-number directly' },
    );
  } else if (given(raw.fNumber)) {
    fNumber = raw.fNumber;
  } else {
    problems.push({ field: 'fNumber', message: 'Give the f-number, or the aperture and focal length to derive it' });
  }

  // Obstruction ratio ε = obstruction diameter / aperture diameter.
  let obstruction = given(raw.obstruction) ? raw.obstruction : 0;
  if (given(raw.obstructionMm)) {
    if (!hasAperture) {
      problems.push({ field: 'obstructionMm', message: 'An obstruction diameter needs the aperture diameter to give a ratio' });
    } else {
      const ratio = raw.obstructionMm / raw.apertureMm!;
      derived.obstruction = true;
      const [, hi] = OPTIC_LIMITS.obstruction;
      if (ratio > hi) {
        problems.push({
          field: 'obstructionMm',
          message: `A ${raw.obstructionMm} mm obstruction on a ${raw.apertureMm} mm aperture is a ratio of ${fmt(ratio)}; it must be at most ${hi}`,
        });
      } else if (given(raw.obstruction) && Math.abs(raw.obstruction - ratio) > AGREEMENT.obstruction) {
        problems.push({
          field: 'obstruction',
          message: `Obstruction ratio ${raw.obstruction} disagrees with ${raw.obstructionMm} mm on ${raw.apertureMm} mm (${fmt(ratio)}); send one or the other`,
        });
      }
      obstruction = ratio;
    }
  }

  // Chief-ray angle at the field edge, from the sensor half-diagonal seen from the exit pupil.
  let fieldAngleDeg = given(raw.fieldAngleDeg) ? raw.fieldAngleDeg : 0;
  const hasSensor = given(raw.sensorDiagonalMm);
  const hasPupil = given(raw.exitPupilDistanceMm);
  if (hasSensor && hasPupil) {
    const angle = Math.atan(raw.sensorDiagonalMm! / 2 / raw.exitPupilDistanceMm!) / DEG;
    derived.fieldAngleDeg = true;
    const [, hi] = OPTIC_LIMITS.fieldAngleDeg;
    if (angle > hi) {
      problems.push({
        field: 'fieldAngleDeg',
        message: `A ${raw.sensorDiagonalMm} mm sensor diagonal ${raw.exitPupilDistanceMm} mm from the exit pupil gives a ${fmt(angle, 1)}° chief ray; angles must be between 0 and ${hi}°`,
      });
    } else if (given(raw.fieldAngleDeg) && Math.abs(raw.fieldAngleDeg - angle) > AGREEMENT.fieldAngleDeg) {
      problems.push({
        field: 'fieldAngleDeg',
        message: `Chief-ray angle ${raw.fieldAngleDeg}° disagrees with the sensor and exit pupil (${fmt(angle, 1)}°); send one or the other`,
      });
    }
    fieldAngleDeg = angle;
  } else if (hasSensor !== hasPupil) {
    problems.push(
      hasSensor
        ? { field: 'exitPupilDistanceMm', message: 'Give the exit-pupil distance too, or type the chief-ray angle directly' }
        : { field: 'sensorDiagonalMm', message: 'Give the sensor diagonal too, or type the chief-ray angle directly' },
    );
  }

  return { fNumber, obstruction, fieldAngleDeg, workingFocalLengthMm, derived, problems };
}

export type OpticInput = {
  name: string;
  description: string | null;
  apertureMm: number | null;
  focalLengthMm: number | null;
  obstructionMm: number | null;
  reducerFactor: number | null;
  sensorDiagonalMm: number | null;
  exitPupilDistanceMm: number | null;
  fNumber: number;
  obstruction: number;
  fieldAngleDeg: number;
  derived: DerivedFrom;
};

/** POST /api/optics, and the form. */
export const opticInputSchema = z
  .object(opticRawShape)
  .superRefine((raw, ctx) => {
    for (const p of deriveOptic(raw).problems) ctx.addIssue({ code: 'custom', path: [p.field], message: p.message });
  })
  .transform((raw): OpticInput => {
    const d = deriveOptic(raw);
    return {
      name: raw.name,
      description: raw.description ?? null,
      apertureMm: raw.apertureMm ?? null,
      focalLengthMm: raw.focalLengthMm ?? null,
      obstructionMm: raw.obstructionMm ?? null,
      reducerFactor: raw.reducerFactor ?? null,
      sensorDiagonalMm: raw.sensorDiagonalMm ?? null,
      exitPupilDistanceMm: raw.exitPupilDistanceMm ?? null,
      fNumber: d.fNumber as number,
      obstruction: d.obstruction,
      fieldAngleDeg: d.fieldAngleDeg,
      derived: d.derived,
    };
  });

export type OpticFormValues = z.input<typeof opticInputSchema>;

export const OPTIC_FIELDS = Object.keys(opticRawShape) as (keyof OpticRaw)[];

/**
 * PATCH /api/optics/:id: any subset of the fields; null clears one. The handler
 * merges it over the stored optic and validates the result with opticInputSchema.
 */
export const opticPatchSchema = z
  .record(z.string(), z.unknown(), { error: 'Send a JSON object of the fields to change' })
  .superRefine((body, ctx) => {
    const known = new Set<string>(OPTIC_FIELDS);
    const fields = Object.keys(body).filter((k) => known.has(k));
    if (fields.length === 0) ctx.addIssue({ code: 'custom', message: `Send at least one of ${OPTIC_FIELDS.join(', ')}` });
    if ('name' in body && body.name === null) ctx.addIssue({ code: 'custom', path: ['name'], message: 'An optic keeps its name; send a new one instead of null' });
  });
