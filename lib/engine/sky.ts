/**
 * Against my sky: what a curve on an optic lets through of light pollution and
 * airglow, and how much contrast it gives over a reference.
 *
 * Sky lines leak with the cone-averaged throughput τᵢ at their wavelength (the
 * same kernel as the target line, docs/model.md §Throughput). A continuum flat over the
 * passband is accepted in proportion to
 *   continuumNm = ∫ T_cone(λ) dλ            (nm, not divided by the peak).
 * For one ray, T_θ(λ) = T_m(s_m·(λ/s − Δ)), so ∫ T_θ dλ = (s / s_m) · ∫ T_m dx
 * exactly; averaged over the pupil,
 *   continuumNm = (∫ T_m dx / s_m) · E[s],
 * with E[s] from the same pupil density the line throughput uses (zero outside
 * the measured range, as everywhere in the model).
 *
 * Background B = c · continuumNm + Σ τᵢ · Iᵢ for a sky model with continuum level
 * c (per nm) and line strengths Iᵢ (same units · nm). In a background-limited
 * exposure the noise is sqrt(B) and the signal ∝ τ, so S/N ∝ τ / sqrt(B) (the
 * standard CCD signal-to-noise equation with the sky term dominant:
 * S. B. Howell, Handbook of CCD Astronomy, 2nd ed., §4.4; common practice). The
 * contrast gain over a reference is therefore
 *   gain = (τ / τ_ref) / sqrt(B / B_ref).
 */

import { coneKernel, lineThroughput, shiftFrame, type ConeKernel } from './cone';
import { cleanPoints, prepareCurve, type PreparedCurve } from './curve';
import { EngineInputError, type InputDetail } from './errors';
import type { Pupil } from './pupil';
import type { CurvePoints, ShiftParams } from './types';

export interface SkyLine {
  id: string;
  name: string;
  /** Standard air wavelength, nm. */
  airNm: number;
  source: 'mercury' | 'sodium' | 'airglow';
}

/**
 * Sky lines, standard air wavelengths (NIST Atomic Spectra Database, Hg I, Na I
 * and [O I] lines; values from memory).
 */
export const SKY_LINES: readonly SkyLine[] = Object.freeze([
  { id: 'Hg-435.8', name: 'Hg 435.8', airNm: 435.833, source: 'mercury' },
  { id: 'Hg-546.1', name: 'Hg 546.1', airNm: 546.074, source: 'mercury' },
  { id: 'Hg-577.0', name: 'Hg 577.0', airNm: 576.96, source: 'mercury' },
  { id: 'Hg-579.1', name: 'Hg 579.1', airNm: 579.066, source: 'mercury' },
  { id: 'Na-589.0', name: 'Na D2 589.0', airNm: 588.995, source: 'sodium' },
  { id: 'Na-589.6', name: 'Na D1 589.6', airNm: 589.592, source: 'sodium' },
  { id: 'OI-557.7', name: '[O I] 557.7', airNm: 557.734, source: 'airglow' },
  { id: 'OI-630.0', name: '[O I] 630.0', airNm: 630.03, source: 'airglow' },
  { id: 'OI-636.4', name: '[O I] 636.4', airNm: 636.378, source: 'airglow' },
]);

export interface SkyModel {
  /** Continuum level per nm, in the same arbitrary units as the line strengths. */
  continuum: number;
  /** Line strength by sky-line id (units × nm, i.e. integrated over the line). */
  lines: Partial<Record<string, number>>;
}

export interface SkyModelPreset extends SkyModel {
  id: string;
  name: string;
  /** Where the numbers come from, in plain words. */
  basis: string;
}

const ILLUSTRATIVE =
  'Illustrative: relative strengths chosen to show the typical balance of lines and continuum, not measured at any site. Type your own for a real sky.';

/**
 * Shipped sky models. The strengths are illustrative (not from a published
 * survey); the airglow lines keep the fixed ratio [O I] 630.0 : 636.4 ≈ 3 : 1
 * (common practice, from memory).
 */
export const SKY_MODELS: readonly SkyModelPreset[] = Object.freeze([
  {
    id: 'dark',
    name: 'Dark site (airglow only)',
    basis: ILLUSTRATIVE,
    continuum: 1,
    lines: { 'OI-557.7': 30, 'OI-630.0': 9, 'OI-636.4': 3 },
  },
  {
    id: 'suburban',
    name: 'Suburban, mercury and sodium lamps',
    basis: ILLUSTRATIVE,
    continuum: 4,
    lines: { 'Hg-435.8': 25, 'Hg-546.1': 40, 'Hg-577.0': 10, 'Hg-579.1': 12, 'Na-589.0': 45, 'Na-589.6': 25, 'OI-557.7': 30, 'OI-630.0': 9, 'OI-636.4': 3 },
  },
  {
    id: 'led-town',
    name: 'LED-lit town (broad continuum)',
    basis: ILLUSTRATIVE,
    continuum: 12,
    lines: { 'Hg-546.1': 5, 'Na-589.0': 6, 'Na-589.6': 3, 'OI-557.7': 30, 'OI-630.0': 9, 'OI-636.4': 3 },
  },
]);

/** A sky line this close to the target line is the target itself, nm. */
export const SAME_LINE_NM = 0.1;

export function findSkyModel(id: string): SkyModelPreset | undefined {
  return SKY_MODELS.find((m) => m.id === id);
}

export function validateSkyModel(model: SkyModel, field = 'sky.model'): InputDetail[] {
  const d: InputDetail[] = [];
  if (!(typeof model.continuum === 'number' && Number.isFinite(model.continuum) && model.continuum >= 0)) {
    d.push({ field: `${field}.continuum`, message: 'the continuum level must be a number of at least 0' });
  }
  for (const [id, v] of Object.entries(model.lines ?? {})) {
    if (!SKY_LINES.some((l) => l.id === id)) d.push({ field: `${field}.lines.${id}`, message: `"${id}" is not one of ${SKY_LINES.map((l) => l.id).join(', ')}` });
    else if (!(typeof v === 'number' && Number.isFinite(v) && v >= 0)) d.push({ field: `${field}.lines.${id}`, message: 'a line strength must be a number of at least 0' });
  }
  if (model.continuum === 0 && Object.values(model.lines ?? {}).every((v) => !v)) {
    d.push({ field, message: 'the sky model is completely dark: give a continuum or at least one line' });
  }
  return d;
}

/** E[s] over the pupil: ∫ (1/g)·(c0 + c1·(g − g_k)) dg on each bin of the kernel, in closed form. */
export function meanAngleScale(kernel: ConeKernel): number {
  const { g, c0, c1, weights } = kernel;
  let sum = 0;
  for (let k = 0; k < weights.length; k++) {
    const g0 = g[k];
    const g1 = g[k + 1];
    const L = g1 - g0;
    if (!(L > 1e-14)) {
      sum += weights[k] / g0;
      continue;
    }
    const ln = Math.log(g1 / g0);
    sum += c0[k] * ln + c1[k] * (L - g0 * ln);
  }
  return sum;
}

/** ∫ T_cone dλ, nm: the continuum a curve accepts through this pupil. */
export function acceptedContinuumNm(c: PreparedCurve, pupil: Pupil, params: ShiftParams): number {
  const { sM } = shiftFrame(params);
  return (c.total / sM) * meanAngleScale(coneKernel(pupil, params.nEff));
}

export interface SkyLineResult {
  id: string;
  wavelengthNm: number;
  /** Cone-averaged leakage; null when the curve's measured range does not reach this line. */
  throughput: number | null;
  covered: boolean;
  /** The sky line is the target line itself (e.g. [O I] 630.0 for an [O I] filter): not counted as background. */
  isTarget: boolean;
}

export interface SkyResult {
  lines: SkyLineResult[];
  continuumNm: number;
  /** B = c · continuumNm + Σ τᵢ Iᵢ over covered lines that are not the target. */
  background: number;
  warnings: string[];
}

export function skyLeakage(c: PreparedCurve, pupil: Pupil, params: ShiftParams, targetNm: number, model: SkyModel): SkyResult {
  const warnings: string[] = [];
  const continuumNm = acceptedContinuumNm(c, pupil, params);
  let background = model.continuum * continuumNm;
  const missed: string[] = [];
  const lines = SKY_LINES.map((l): SkyLineResult => {
    const r = lineThroughput(c, pupil, l.airNm, params);
    const isTarget = Math.abs(l.airNm - targetNm) <= SAME_LINE_NM;
    const strength = model.lines[l.id] ?? 0;
    if (isTarget) {
      warnings.push(`The target line is itself the sky line ${l.name} nm; it is counted as signal, not as background.`);
    } else if (!r.covered) {
      if (strength > 0) missed.push(l.name);
    } else background += strength * r.throughput;
    return { id: l.id, wavelengthNm: l.airNm, throughput: r.covered ? r.throughput : null, covered: r.covered, isTarget };
  });
  if (missed.length > 0) {
    const one = missed.length === 1;
    warnings.push(`The curve's measured range does not reach ${missed.join(', ')} nm, so ${one ? 'its' : 'their'} leakage is unknown and left out of the background.`);
  }
  return { lines, continuumNm, background, warnings };
}

/**
 * An ideal reference filter W nm wide centred on the target on this optic: it
 * passes the whole target line (τ = 1), exactly W nm of continuum and every sky
 * line within W/2 of the target.
 */
export function boxReference(widthNm: number, targetNm: number, model: SkyModel): { throughput: number; background: number } {
  if (!(widthNm > 0 && Number.isFinite(widthNm))) {
    throw new EngineInputError('The reference box width must be a positive number of nm.', [{ field: 'sky.reference.boxFwhmNm', message: 'must be > 0' }]);
  }
  let background = model.continuum * widthNm;
  for (const l of SKY_LINES) {
    const d = Math.abs(l.airNm - targetNm);
    if (d > SAME_LINE_NM && d <= widthNm / 2) background += model.lines[l.id] ?? 0;
  }
  return { throughput: 1, background };
}

/** gain = (τ / τ_ref) / sqrt(B / B_ref); null when either side has no signal or no background. */
export function contrastGain(tau: number, background: number, tauRef: number, backgroundRef: number): number | null {
  if (!(tau > 0 && tauRef > 0 && background > 0 && backgroundRef > 0)) return null;
  return tau / tauRef / Math.sqrt(background / backgroundRef);
}

/** What the cone request's `sky` carries once a reference curve id has been resolved to points. */
export interface SkyRequest {
  model: string | SkyModel;
  reference?: { points: CurvePoints; measuredAoiDeg?: number; label?: string } | { boxFwhmNm: number };
}

export interface SkyStudy {
  model: { id: string; name: string; basis: string };
  lines: SkyLineResult[];
  continuumNm: number;
  background: number;
  gain?: number | null;
  reference?: { kind: 'curve' | 'box'; label: string; throughput: number; background: number; continuumNm: number };
}

export function resolveSkyModel(model: string | SkyModel): { id: string; name: string; basis: string; model: SkyModel } {
  if (typeof model === 'string') {
    const found = findSkyModel(model);
    if (!found) {
      throw new EngineInputError(`Unknown sky model "${model}".`, [{ field: 'sky.model', message: `"${model}" is not one of ${SKY_MODELS.map((m) => m.id).join(', ')}, nor a typed model` }]);
    }
    return { id: found.id, name: found.name, basis: found.basis, model: found };
  }
  const d = validateSkyModel(model);
  if (d.length > 0) throw new EngineInputError(`Invalid sky model: ${d[0].message} (${d[0].field}).`, d);
  return { id: 'custom', name: 'Typed sky', basis: 'Typed by the user.', model };
}

/** The `sky` block of the cone study for the curve `c` whose target line reads τ at `targetNm`. */
export function skyStudy(c: PreparedCurve, pupil: Pupil, params: ShiftParams, targetNm: number, tau: number, request: SkyRequest, warnings: string[]): SkyStudy {
  const { id, name, basis, model } = resolveSkyModel(request.model);
  const own = skyLeakage(c, pupil, params, targetNm, model);
  warnings.push(...own.warnings);
  const out: SkyStudy = { model: { id, name, basis }, lines: own.lines, continuumNm: own.continuumNm, background: own.background };
  const ref = request.reference;
  if (!ref) return out;
  if ('boxFwhmNm' in ref) {
    const box = boxReference(ref.boxFwhmNm, targetNm, model);
    out.reference = { kind: 'box', label: `ideal ${ref.boxFwhmNm} nm box`, throughput: box.throughput, background: box.background, continuumNm: ref.boxFwhmNm };
  } else {
    const rc = prepareCurve(cleanPoints(ref.points).points);
    const refParams: ShiftParams = { nEff: params.nEff, measuredAoiDeg: ref.measuredAoiDeg };
    const rt = lineThroughput(rc, pupil, targetNm, refParams);
    const rs = skyLeakage(rc, pupil, refParams, targetNm, model);
    const label = ref.label ?? 'the reference curve';
    for (const w of rs.warnings) warnings.push(`Reference: ${w}`);
    if (!rt.covered) warnings.push(`Reference: the cone at the target line reaches beyond ${label}'s measured range.`);
    out.reference = { kind: 'curve', label, throughput: rt.throughput, background: rs.background, continuumNm: rs.continuumNm };
  }
  out.gain = contrastGain(tau, own.background, out.reference.throughput, out.reference.background);
  if (out.gain === null) warnings.push('The contrast gain is undefined: one of the two filters passes no line or no background.');
  return out;
}
