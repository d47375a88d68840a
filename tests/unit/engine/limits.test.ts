import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { INSTRUMENTS, MODEL_REACH, REQUEST_LIMITS, type Range } from '@/lib/engine/limits';
import { LINE_IDS, LINES } from '@/lib/engine/lines';
import { validateShift } from '@/lib/engine/cone';
import { validateOptic } from '@/lib/engine/pupil';
import { DEFAULT_WAVELENGTH_UNCERTAINTY_NM } from '@/lib/engine/quality';
import { coneRequestSchema, neffRequestSchema, opticSchema } from '@/lib/schemas/model';
import { chiefRayRowSchema, fieldMapRequestSchema } from '@/lib/schemas/field-map';
import { oddsQuerySchema } from '@/lib/schemas/odds';
import { opticInputSchema } from '@/lib/schemas/optics';
import { methodSchema, submissionMetadataSchema } from '@/lib/schemas/submission';
import { searchParamsSchema } from '@/lib/catalogue/search-params';
import { checkNumber } from '@/lib/study/url-state';

// The schemas (every request, form and link) and the engine read one module,
// lib/engine/limits.ts. Each schema must accept exactly REQUEST_LIMITS at its
// boundaries, and the engine must accept every value a schema lets through.

const EPS = 1e-6;
const points = { wavelengthNm: [650, 652, 654, 656, 658], transmission: [0.1, 0.5, 0.9, 0.5, 0.1] };
const cone = (extra: Record<string, unknown>) => coneRequestSchema.safeParse({ points, optic: { fNumber: 2 }, nEff: 2, ...extra }).success;
const field = (extra: Record<string, unknown>) =>
  fieldMapRequestSchema.safeParse({ points, optic: { fNumber: 2 }, nEff: 2, lineNm: 656.28, sensor: { widthMm: 20, heightMm: 15 }, ...extra }).success;
const odds = (extra: Record<string, string>) => oddsQuerySchema.safeParse({ label: 'x', fNumber: '2', minThroughput: '0.8', line: 'Ha', ...extra }).success;
const search = (extra: Record<string, string>) => searchParamsSchema.safeParse({ fNumber: '2', ...extra }).success;
const method = { instrument: 'spectrophotometer', resolutionNm: 1, beam: 'collimated', aoiDeg: 0 };
const submission = (files: unknown[]) =>
  submissionMetadataSchema.safeParse({ label: 'Test filter', lines: ['Ha'], nominalCwlNm: 656, nominalFwhmNm: 3, method, files }).success;
const engineShift = (p: Record<string, number>) => validateShift({ nEff: 2, ...p }).length === 0;
const engineOptic = (p: Record<string, number>) => {
  try {
    validateOptic({ fNumber: 2, obstruction: 0, ...p });
    return true;
  } catch {
    return false;
  }
};

type Case = { limit: keyof typeof REQUEST_LIMITS; where: string; accepts: (v: number) => boolean };

const SCHEMAS: Case[] = [
  { limit: 'fNumber', where: 'POST /api/model/cone optic', accepts: (v) => opticSchema.safeParse({ fNumber: v, obstruction: 0 }).success },
  { limit: 'fNumber', where: 'field-map chief-ray table', accepts: (v) => chiefRayRowSchema.safeParse({ imageHeightMm: 1, chiefRayDeg: 1, fNumber: v }).success },
  { limit: 'fNumber', where: 'optics form', accepts: (v) => opticInputSchema.safeParse({ name: 'x', fNumber: v }).success },
  { limit: 'fNumber', where: 'odds query', accepts: (v) => odds({ fNumber: String(v) }) },
  { limit: 'fNumber', where: 'catalogue search', accepts: (v) => search({ fNumber: String(v) }) },
  { limit: 'fNumber', where: 'study link', accepts: (v) => checkNumber('f', String(v)).error === undefined },
  { limit: 'nEff', where: 'POST /api/model/cone', accepts: (v) => cone({ nEff: v }) },
  { limit: 'nEff', where: 'POST /api/model/field-map', accepts: (v) => field({ nEff: v, cornerAngleDeg: 10 }) },
  { limit: 'nEff', where: 'odds query', accepts: (v) => odds({ nEff: String(v) }) },
  { limit: 'nEff', where: 'catalogue search', accepts: (v) => search({ nEff: String(v) }) },
  { limit: 'nEff', where: 'study link', accepts: (v) => checkNumber('n', String(v)).error === undefined },
  { limit: 'fieldAngleDeg', where: 'POST /api/model/cone optic', accepts: (v) => opticSchema.safeParse({ fNumber: 2, obstruction: 0, fieldAngleDeg: v }).success },
  { limit: 'fieldAngleDeg', where: 'optics form', accepts: (v) => opticInputSchema.safeParse({ name: 'x', fNumber: 2, fieldAngleDeg: v }).success },
  { limit: 'fieldAngleDeg', where: 'odds query', accepts: (v) => odds({ fieldAngleDeg: String(v) }) },
  { limit: 'fieldAngleDeg', where: 'catalogue search', accepts: (v) => search({ fieldAngleDeg: String(v) }) },
  { limit: 'fieldAngleDeg', where: 'study link', accepts: (v) => checkNumber('field', String(v)).error === undefined },
  { limit: 'chiefRayDeg', where: 'field-map chief-ray table', accepts: (v) => chiefRayRowSchema.safeParse({ imageHeightMm: 1, chiefRayDeg: v }).success },
  { limit: 'chiefRayDeg', where: 'field-map corner angle', accepts: (v) => field({ cornerAngleDeg: v }) },
  { limit: 'measuredAoiDeg', where: 'POST /api/model/cone', accepts: (v) => cone({ measuredAoiDeg: v }) },
  { limit: 'measuredAoiDeg', where: 'POST /api/model/field-map', accepts: (v) => field({ measuredAoiDeg: v, cornerAngleDeg: 10 }) },
  { limit: 'measuredAoiDeg', where: 'POST /api/model/neff', accepts: (v) => neffRequestSchema.safeParse({ measurements: [{ aoiDeg: 0, cwlNm: 656 }, { aoiDeg: v, cwlNm: 650 }] }).success },
  { limit: 'measuredAoiDeg', where: 'submission method', accepts: (v) => methodSchema.safeParse({ ...method, aoiDeg: v }).success },
  { limit: 'measuredAoiDeg', where: 'submission file', accepts: (v) => submission([{ name: 'a.csv', aoiDeg: v }]) },
  { limit: 'measuredAoiDeg', where: 'catalogue search aoiMax', accepts: (v) => search({ aoiMax: String(v) }) },
  { limit: 'preShiftNm', where: 'POST /api/model/cone', accepts: (v) => cone({ preShiftNm: v }) },
  { limit: 'preShiftNm', where: 'POST /api/model/field-map', accepts: (v) => field({ preShiftNm: v, cornerAngleDeg: 10 }) },
  { limit: 'preShiftNm', where: 'odds query', accepts: (v) => odds({ preShiftNm: String(v) }) },
  { limit: 'preShiftNm', where: 'study link', accepts: (v) => checkNumber('shift', String(v)).error === undefined },
  { limit: 'tempCoeffNmPerC', where: 'POST /api/model/cone', accepts: (v) => cone({ tempCoeffNmPerC: v }) },
  { limit: 'tempCoeffNmPerC', where: 'study link', accepts: (v) => checkNumber('k', String(v)).error === undefined },
  { limit: 'wavelengthUncertaintyNm', where: 'POST /api/model/cone', accepts: (v) => cone({ wavelengthUncertaintyNm: v }) },
];

/** The engine's own check for each limit a request carries into it, and the range it accepts. */
const ENGINE: Partial<Record<keyof typeof REQUEST_LIMITS, { reach: Range; accepts: (v: number) => boolean }>> = {
  nEff: { reach: REQUEST_LIMITS.nEff, accepts: (v) => engineShift({ nEff: v }) },
  fieldAngleDeg: { reach: MODEL_REACH.fieldAngleDeg, accepts: (v) => engineOptic({ fieldAngleDeg: v }) },
  chiefRayDeg: { reach: MODEL_REACH.fieldAngleDeg, accepts: (v) => engineOptic({ fieldAngleDeg: v }) },
  measuredAoiDeg: { reach: MODEL_REACH.measuredAoiDeg, accepts: (v) => engineShift({ measuredAoiDeg: v }) },
  preShiftNm: { reach: MODEL_REACH.preShiftNm, accepts: (v) => engineShift({ preShiftNm: v }) },
  tempCoeffNmPerC: { reach: REQUEST_LIMITS.tempCoeffNmPerC, accepts: (v) => engineShift({ tempCoeffNmPerC: v }) },
};

describe('every schema accepts exactly REQUEST_LIMITS (lib/engine/limits.ts)', () => {
  it.each(SCHEMAS.map((c) => [c.limit, c.where, c] as const))('%s in the %s', (_l, _w, c) => {
    const [lo, hi] = REQUEST_LIMITS[c.limit];
    expect(c.accepts(lo)).toBe(true);
    expect(c.accepts(hi)).toBe(true);
    expect(c.accepts((lo + hi) / 2)).toBe(true);
    expect(c.accepts(lo - EPS)).toBe(false);
    expect(c.accepts(hi + EPS)).toBe(false);
  });
});

describe('the engine accepts every request a schema lets through', () => {
  it.each(Object.entries(ENGINE))('%s: the engine takes exactly its reach, which holds the request range', (limit, e) => {
    const [lo, hi] = e!.reach;
    expect(e!.accepts(lo)).toBe(true);
    expect(e!.accepts(hi)).toBe(true);
    expect(e!.accepts(lo - EPS)).toBe(false);
    expect(e!.accepts(hi + EPS)).toBe(false);
    const [rlo, rhi] = REQUEST_LIMITS[limit as keyof typeof REQUEST_LIMITS];
    expect(e!.accepts(rlo)).toBe(true);
    expect(e!.accepts(rhi)).toBe(true);
  });

  it('the f-number a schema accepts builds a pupil, and the one below it does not', () => {
    const [lo, hi] = REQUEST_LIMITS.fNumber;
    expect(engineOptic({ fNumber: lo })).toBe(true);
    expect(engineOptic({ fNumber: hi })).toBe(true);
    expect(engineOptic({ fNumber: lo - EPS })).toBe(false);
  });

  it("the error bars (pre-shift ± the largest wavelength uncertainty) stay inside the engine's reach", () => {
    const extreme = REQUEST_LIMITS.preShiftNm[1] + REQUEST_LIMITS.wavelengthUncertaintyNm[1];
    expect(engineShift({ preShiftNm: extreme })).toBe(true);
    expect(engineShift({ preShiftNm: -extreme })).toBe(true);
  });
});

describe('the lists', () => {
  it("the submission schema's target lines are the engine's catalogue", () => {
    expect(LINE_IDS).toEqual(LINES.map((l) => l.id));
    for (const id of LINE_IDS) expect(submissionMetadataSchema.shape.lines.safeParse([id]).success).toBe(true);
    expect(submissionMetadataSchema.shape.lines.safeParse(['Hz']).success).toBe(false);
  });

  it('the instrument kinds are those the database allows and those with a default wavelength accuracy', () => {
    const migration = readFileSync(path.join(import.meta.dirname, '../../../db/migrations/0001_foundation.ts'), 'utf8');
    const inDb = /instrument IN \(([^)]*)\)/.exec(migration)![1].split(',').map((s) => s.trim().replace(/'/g, ''));
    expect([...INSTRUMENTS]).toEqual(inDb);
    expect(Object.keys(DEFAULT_WAVELENGTH_UNCERTAINTY_NM).sort()).toEqual([...INSTRUMENTS].sort());
    for (const instrument of INSTRUMENTS) expect(methodSchema.safeParse({ ...method, instrument }).success).toBe(true);
    expect(methodSchema.safeParse({ ...method, instrument: 'photometer' }).success).toBe(false);
  });
});
