/**
 * The limits and lists that the request schemas (lib/schemas/) and the engine
 * both read, so the two cannot drift apart.
 *
 * Two tiers:
 * - REQUEST_LIMITS: what a request, a form or a stored record may carry; the zod
 *   schemas refuse anything outside it.
 * - MODEL_REACH: how far the numerical core computes (validateShift, validateOptic).
 *   It is wider on purpose: the error bars move a request's pre-shift by ± the
 *   wavelength-scale uncertainty, the study's sensor map adds the temperature
 *   drift to the pre-shift, and a field map's corners reach chief rays of 45°,
 *   all from a request that sits inside REQUEST_LIMITS.
 * tests/unit/engine/limits.test.ts holds both tiers to their boundaries and
 * checks that every request a schema accepts, the engine accepts too.
 */

/** A closed range [min, max]. */
export type Range = readonly [min: number, max: number];

export const REQUEST_LIMITS = {
  /** Working f-number of an optic. */
  fNumber: [0.5, 40],
  /** Effective index (typical 1.5–2.3). */
  nEff: [1, 4],
  /** Chief-ray angle of one field point of an optic, degrees (docs/model.md §Pupil: the API accepts up to 30°). */
  fieldAngleDeg: [0, 30],
  /** Chief-ray angle across a sensor in a field map (corner angle, chief-ray table), degrees. */
  chiefRayDeg: [0, 45],
  /** AOI a curve was measured at, degrees: submissions, stored curves, the n_eff fit and the model's measuredAoiDeg. */
  measuredAoiDeg: [0, 60],
  /** Pre-shift of a filter toward the red, nm. */
  preShiftNm: [-50, 50],
  /** Temperature coefficient of the passband, nm/°C. */
  tempCoeffNmPerC: [-1, 1],
  /** Standard uncertainty of a wavelength scale, nm (the error bars). */
  wavelengthUncertaintyNm: [0, 10],
} as const satisfies Record<string, Range>;

export const MODEL_REACH = {
  /** buildPupil's field angle, degrees: the field map's chief rays. */
  fieldAngleDeg: [0, REQUEST_LIMITS.chiefRayDeg[1]],
  /** validateShift's measurement AOI, degrees. */
  measuredAoiDeg: [0, 80],
  /** validateShift's pre-shift, nm: a request's pre-shift ± the largest wavelength uncertainty, plus a temperature drift. */
  preShiftNm: [-200, 200],
} as const satisfies Record<string, Range>;

/** Instrument kinds a method names (the submission form, the catalogue's method filter and facets, the default wavelength accuracy). */
export const INSTRUMENTS = ['spectrophotometer', 'spectrograph', 'monochromator', 'other'] as const;
export type Instrument = (typeof INSTRUMENTS)[number];

export function inRange(v: unknown, [min, max]: Range): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v >= min && v <= max;
}
