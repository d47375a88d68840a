import { z } from 'zod';
import { MAX_GRID } from '@/lib/engine/field-map';
import { REQUEST_LIMITS as L } from '@/lib/engine/limits';
import { nEffSchema, opticSchema, pointsSchema } from './model';

const mm = (what: string, max: number) =>
  z.number({ error: `${what} must be a number of mm` }).refine(Number.isFinite, `${what} must be finite`).refine((v) => v > 0, `${what} must be above 0 mm`).refine((v) => v <= max, `${what} must be at most ${max} mm`);

const preShiftMessage = `the pre-shift must be within ±${L.preShiftNm[1]} nm`;

export const chiefRayRowSchema = z.object({
  imageHeightMm: z.number({ error: 'imageHeightMm must be a number of mm' }).min(0, 'the image height cannot be negative').max(200, 'the image height must be at most 200 mm'),
  chiefRayDeg: z.number({ error: 'chiefRayDeg must be a number of degrees' }).min(L.chiefRayDeg[0], 'the chief-ray angle cannot be negative').max(L.chiefRayDeg[1], `the chief-ray angle must be at most ${L.chiefRayDeg[1]}°`),
  fNumber: z.number({ error: 'fNumber must be a number' }).min(L.fNumber[0], `the f-number must be at least ${L.fNumber[0]}`).max(L.fNumber[1], `the f-number must be at most ${L.fNumber[1]}`).optional(),
});

/**
 * POST /api/model/field-map (docs/model.md, field map). An optic is typed
 * (`optic`) or saved (`opticId`); a saved optic's exit-pupil distance and sensor
 * diagonal fill in whatever the request leaves out.
 */
export const fieldMapRequestSchema = z
  .object({
    curveId: z.number().int().positive().optional(),
    points: pointsSchema.optional(),
    optic: opticSchema.omit({ fieldAngleDeg: true }).optional(),
    opticId: z.number().int().positive().optional(),
    sensor: z.object({ widthMm: mm('sensor.widthMm', 200), heightMm: mm('sensor.heightMm', 200) }).optional(),
    exitPupilMm: mm('exitPupilMm', 100_000).optional(),
    cornerAngleDeg: z.number({ error: 'cornerAngleDeg must be a number of degrees' }).min(L.chiefRayDeg[0], 'the corner angle cannot be negative').max(L.chiefRayDeg[1], `the corner angle must be at most ${L.chiefRayDeg[1]}°`).optional(),
    chiefRayTable: z.array(chiefRayRowSchema).min(1, 'the chief-ray table needs at least one row').max(100, 'at most 100 table rows').optional(),
    nEff: nEffSchema,
    lineNm: z.number({ error: 'lineNm is required: the line wavelength in nm (standard air)' }).positive('lineNm must be positive').max(5000, 'lineNm must be at most 5000 nm'),
    measuredAoiDeg: z.number().min(L.measuredAoiDeg[0]).max(L.measuredAoiDeg[1]).optional(),
    preShiftNm: z.number().min(L.preShiftNm[0], preShiftMessage).max(L.preShiftNm[1], preShiftMessage).optional(),
    grid: z
      .object({
        nx: z.number().int('grid.nx must be a whole number').min(2, 'grid.nx must be at least 2').max(MAX_GRID, `grid.nx must be at most ${MAX_GRID}`),
        ny: z.number().int('grid.ny must be a whole number').min(2, 'grid.ny must be at least 2').max(MAX_GRID, `grid.ny must be at most ${MAX_GRID}`),
      })
      .optional(),
    thresholds: z.array(z.number().min(0, 'a threshold is a fraction from 0 to 1').max(1, 'a threshold is a fraction from 0 to 1')).max(20, 'at most 20 thresholds').optional(),
  })
  .strict()
  .refine((b) => (b.curveId === undefined) !== (b.points === undefined), { message: 'Send either curveId or points, not both and not neither', path: ['curveId'] })
  .refine((b) => (b.optic === undefined) !== (b.opticId === undefined), { message: 'Send either optic or opticId, not both and not neither', path: ['optic'] })
  .refine((b) => [b.exitPupilMm, b.cornerAngleDeg, b.chiefRayTable].filter((v) => v !== undefined).length <= 1, {
    message: 'Send one of exitPupilMm, cornerAngleDeg or chiefRayTable, not several',
    path: ['exitPupilMm'],
  });

export type FieldMapRequest = z.infer<typeof fieldMapRequestSchema>;
