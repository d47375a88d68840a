/**
 * A cone study computed from the engine alone, so the browser shows exactly the
 * numbers POST /api/model/cone gives for the same inputs: the headline numbers
 * come from `runConeModel` itself, and the sweeps behind the charts call the same
 * `lineThroughput` the model does.
 */

import { DEFAULT_REF_TEMP_C, lineThroughput, temperatureShiftNm } from '@/lib/engine/cone';
import { angleScale } from '@/lib/engine/angles';
import { runConeModel, CUSTOM_LINE_ID } from '@/lib/engine/cone-study';
import { cleanPoints, prepareCleanCurve, type PreparedCurve } from '@/lib/engine/curve';
import { halfMaximumEdges } from '@/lib/engine/metrics';
import { dopplerShift, findLine } from '@/lib/engine/lines';
import { fitEffectiveIndex, predictCwl } from '@/lib/engine/neff';
import { angleHistogram, buildPupil, marginalRayDeg, MAX_FIELD_ANGLE_DEG, type Pupil } from '@/lib/engine/pupil';
import type { AngleBin, ConeModelInput, CurvePoints, Optic, ShiftParams } from '@/lib/engine/types';
import { explorerGrid, type ExplorerGrid, type ExplorerMarker } from './explorer';
import type { CurveStudy, NeffSource, Series, StudyCurve, StudySettings } from './types';
import { defaultTempCoeff } from '@/lib/engine/temperature';
import { headlineFieldAngle } from '@/lib/optics/headline-field';

/** Used when neither the reader nor a fitted set gives an effective index (docs/model.md §Angle shift: mid-range of hard-coated narrowband filters). */
export const DEFAULT_N_EFF = 2.0;

export const F_SWEEP = { from: 1, to: 10, step: 0.2 } as const;
/** Points along the field; enough for a smooth line, few enough to stay interactive. */
const FIELD_STEPS = 24;
const SHIFT_STEPS = 160;
/** Same threshold as the engine: below it the speed-equivalent f-number is infinite. */
const ZERO_THROUGHPUT = 1e-12;
/** Field range shown when the optic has no chief-ray angle: where fast lenses reach (docs/model.md §Pupil). */
export const DEFAULT_FIELD_SPAN_DEG = 10;

export function nEffFor(curve: StudyCurve, s: StudySettings): { value: number; source: NeffSource } {
  if (s.nEff != null) return { value: s.nEff, source: 'typed' };
  if (curve.nEff != null && curve.nEff >= 1 && curve.nEff <= 4) return { value: curve.nEff, source: 'fitted' };
  return { value: DEFAULT_N_EFF, source: 'default' };
}

/**
 * The s and p indices the cone averages (docs/model.md §Polarised sets): the
 * curve's own, fitted from a set measured in polarised light, unless the user
 * typed one n_eff, which then stands for both.
 */
export function nEffPolarisedFor(curve: StudyCurve, s: StudySettings): { s: number; p: number } | null {
  if (s.nEff != null || !curve.nEffPolarised) return null;
  const { s: ns, p: np } = curve.nEffPolarised;
  return ns >= 1 && ns <= 4 && np >= 1 && np <= 4 ? { s: ns, p: np } : null;
}

/**
 * The standard error of a fitted n_eff, from the curve's own set (three or more
 * angles; lib/engine/neff.ts), for the error bars; null when it cannot be said.
 */
export function fittedNeffUncertainty(curve: StudyCurve): number | null {
  if (!curve.set || curve.set.length < 3) return null;
  try {
    const se = fitEffectiveIndex(curve.set.map((p) => ({ aoiDeg: p.aoiDeg, cwlNm: p.cwlNm }))).nEffStdErr;
    return se != null && se > 0 ? Math.min(1, se) : null;
  } catch {
    return null;
  }
}

export function refTempFor(curve: StudyCurve, s: StudySettings): { value: number; source: 'typed' | 'measured' | 'default' } {
  if (s.refTempC != null) return { value: s.refTempC, source: 'typed' };
  if (curve.tempC != null) return { value: curve.tempC, source: 'measured' };
  return { value: DEFAULT_REF_TEMP_C, source: 'default' };
}

/**
 * The temperature coefficient a study applies: the typed one, else the one
 * fitted from the unit's multi-temperature set, else the default for its
 * declared coating (lib/engine/temperature.ts), else none. So an operating
 * temperature alone moves a curve whose coating is known.
 */
export function tempCoeffFor(curve: StudyCurve, s: StudySettings): { value: number; source: 'typed' | 'fitted' | 'coating-default' } | null {
  if (s.tempCoeffNmPerC != null) return { value: s.tempCoeffNmPerC, source: 'typed' };
  if (curve.tempCoeffNmPerC != null && Number.isFinite(curve.tempCoeffNmPerC)) return { value: curve.tempCoeffNmPerC, source: 'fitted' };
  const d = defaultTempCoeff(curve.coating ?? null);
  return d ? { value: d.nmPerC, source: 'coating-default' } : null;
}

/**
 * The body of POST /api/model/cone for this curve and these settings, with the
 * curve's id when it has one (the route then reads the same points and AOI).
 */
export function coneRequestBody(curve: StudyCurve, s: StudySettings, fieldAngleDeg = 0): Record<string, unknown> {
  const body: Record<string, unknown> = curve.id != null ? { curveId: curve.id } : { points: curve.points, measuredAoiDeg: curve.aoiDeg };
  body.optic = {
    fNumber: s.optic.fNumber,
    obstruction: s.optic.obstruction,
    ...(fieldAngleDeg > 0 ? { fieldAngleDeg } : {}),
    ...(s.optic.mapping !== 'tangent' ? { mapping: s.optic.mapping } : {}),
  };
  body.nEff = nEffFor(curve, s).value;
  const sn = nEffFor(curve, s).source === 'fitted' ? fittedNeffUncertainty(curve) : null;
  if (sn) body.nEffUncertainty = sn;
  const sp = nEffPolarisedFor(curve, s);
  if (sp) body.nEffPolarised = sp;
  if (s.preShiftNm !== 0) body.preShiftNm = s.preShiftNm;
  const k = s.tempC != null ? tempCoeffFor(curve, s) : null;
  if (s.tempC != null && k) {
    body.tempC = s.tempC;
    body.tempCoeffNmPerC = k.value;
    body.refTempC = refTempFor(curve, s).value;
  }
  if ('id' in s.line) body.lines = [s.line.id];
  else body.lineNm = s.line.nm;
  if (s.radialVelocityKms !== 0) body.radialVelocityKms = s.radialVelocityKms;
  if (curve.wavelengthUncertainty) body.wavelengthUncertaintyNm = curve.wavelengthUncertainty.nm;
  return body;
}

/** The engine input the route would build from `coneRequestBody`. */
export function modelInput(curve: StudyCurve, s: StudySettings, fieldAngleDeg = 0, includeCurve = false): ConeModelInput {
  const body = coneRequestBody(curve, s, fieldAngleDeg);
  const { curveId: _id, ...rest } = body;
  return {
    ...(rest as Omit<ConeModelInput, 'points'>),
    points: curve.points,
    measuredAoiDeg: curve.aoiDeg,
    includeCurve,
  } as ConeModelInput;
}

const prepared = new WeakMap<CurvePoints, PreparedCurve>();

function prepare(points: CurvePoints): PreparedCurve {
  let c = prepared.get(points);
  if (!c) {
    const clean = cleanPoints(points).points;
    c = prepareCleanCurve(Float64Array.from(clean.wavelengthNm), Float64Array.from(clean.transmission));
    prepared.set(points, c);
  }
  return c;
}

function shiftParams(input: ConeModelInput, preShiftNm = input.preShiftNm): ShiftParams {
  return {
    nEff: input.nEff,
    nEffPolarised: input.nEffPolarised,
    measuredAoiDeg: input.measuredAoiDeg,
    preShiftNm,
    tempCoeffNmPerC: input.tempCoeffNmPerC,
    tempC: input.tempC,
    refTempC: input.refTempC,
  };
}

function range(from: number, to: number, steps: number): number[] {
  if (steps <= 0 || to <= from) return [from];
  return Array.from({ length: steps + 1 }, (_, i) => from + ((to - from) * i) / steps);
}

export function fNumberGrid(): number[] {
  const n = Math.round((F_SWEEP.to - F_SWEEP.from) / F_SWEEP.step);
  return Array.from({ length: n + 1 }, (_, i) => Math.round((F_SWEEP.from + i * F_SWEEP.step) * 10) / 10);
}

/** The chief-ray angles the field picture runs over: centre to the edge (or a default span). */
export function fieldGrid(optic: Optic & { fieldAngleDeg: number }): number[] {
  const edge = optic.fieldAngleDeg > 0 ? optic.fieldAngleDeg : DEFAULT_FIELD_SPAN_DEG;
  // The cone must stay below grazing incidence.
  const marginal = marginalRayDeg(optic.fNumber);
  const top = Math.min(edge, MAX_FIELD_ANGLE_DEG, 89.8 - marginal);
  return range(0, top, FIELD_STEPS);
}

/**
 * Pupils depend on the optic only, never on the curve, so the sweeps share them
 * across curves and across recomputes; the engine's own cache is too small for
 * the hundred-odd optics a study draws.
 */
const pupils = new Map<string, Pupil>();
const PUPIL_LIMIT = 600;

export function studyPupil(o: Optic): Pupil {
  const key = `${o.fNumber}|${o.obstruction}|${o.fieldAngleDeg ?? 0}|${o.mapping ?? 'tangent'}`;
  let p = pupils.get(key);
  if (!p) {
    p = buildPupil(o);
    pupils.set(key, p);
    if (pupils.size > PUPIL_LIMIT) pupils.delete(pupils.keys().next().value as string);
  }
  return p;
}

function sweep(c: PreparedCurve, lineNm: number, xs: number[], pupilAt: (x: number) => Optic, paramsAt: (x: number) => ShiftParams): Series {
  return {
    x: xs,
    y: xs.map((x) => lineThroughput(c, studyPupil(pupilAt(x)), lineNm, paramsAt(x)).throughput),
  };
}

/** One curve through the study's optic, with everything the charts and verdict need. */
export function studyCurve(curve: StudyCurve, s: StudySettings): CurveStudy {
  const n = nEffFor(curve, s);
  const ref = refTempFor(curve, s);
  // the headline's field point (headline-field.ts): on axis; the edge comes from the field sweep below
  const input = modelInput(curve, s, headlineFieldAngle(), true);
  const onAxis = runConeModel(input);

  const c = prepare(curve.points);
  const primary = onAxis.lines[0];
  const lineNm = primary.wavelengthNm;
  const params = shiftParams(input);
  const { obstruction, mapping, fNumber } = s.optic;

  const fSweep = sweep(c, lineNm, fNumberGrid(), (N) => ({ fNumber: N, obstruction, mapping }), () => params);
  const fieldSweep = sweep(c, lineNm, fieldGrid(s.optic), (phi) => ({ fNumber, obstruction, mapping, fieldAngleDeg: phi }), () => params);
  // error band of the f-number chart: the same sweep with the curve moved by ∓ its wavelength-scale uncertainty
  const u = curve.wavelengthUncertainty?.nm ?? 0;
  let fSweepRange: CurveStudy['fSweepRange'];
  if (u > 0) {
    const [a, b] = [-u, u].map((d) => sweep(c, lineNm, fSweep.x, (N) => ({ fNumber: N, obstruction, mapping }), () => ({ ...params, preShiftNm: (params.preShiftNm ?? 0) + d })).y);
    fSweepRange = { low: fSweep.y.map((v, i) => Math.min(v, a[i], b[i])), high: fSweep.y.map((v, i) => Math.max(v, a[i], b[i])), uncertaintyNm: u };
  }

  const sM = curve.aoiDeg > 0 ? angleScale(curve.aoiDeg, n.value) : 1;
  const { leftNm, rightNm } = halfMaximumEdges(c);
  const fwhm0Nm = leftNm !== null && rightNm !== null ? (rightNm - leftNm) / sM : null;
  const totalShiftNm = (input.preShiftNm ?? 0) + temperatureShiftNm(params);
  const cwl0Nm = leftNm !== null && rightNm !== null ? (0.5 * (leftNm + rightNm)) / sM + totalShiftNm : null;

  // The same window the best pre-shift is searched in, so its marker sits on the line.
  const lo = onAxis.bestPreShift ? -(fwhm0Nm ?? 1) : -2;
  const hi = onAxis.bestPreShift ? 2 * (fwhm0Nm ?? 1) : 4;
  const onAxisPupil: Optic = { fNumber, obstruction, mapping };
  // On the best pre-shift's own 0.01 nm grid, so no point of the chart can rise above the marked best.
  const cents = range(lo, hi, SHIFT_STEPS).map((v) => Math.min(Math.floor(hi * 100 + 1e-9), Math.max(Math.ceil(lo * 100 - 1e-9), Math.round(v * 100))));
  const shifts = cents.map((c) => c / 100);
  if (onAxis.bestPreShift) shifts.push(onAxis.bestPreShift.nm);
  shifts.push(s.preShiftNm);
  const uniqueShifts = [...new Set(shifts.map((v) => Math.round(v * 1e6) / 1e6))].sort((a, b) => a - b);
  const shiftSweep = sweep(c, lineNm, uniqueShifts, () => onAxisPupil, (d) => shiftParams(input, d));

  // The field sweep ends at the edge, so its last point is what the model gives for optic.fieldAngleDeg.
  const edgeDeg = fieldSweep.x[fieldSweep.x.length - 1];
  const edgeTau = fieldSweep.y[fieldSweep.y.length - 1];
  const edge =
    s.optic.fieldAngleDeg > 0
      ? {
          fieldAngleDeg: edgeDeg,
          throughput: edgeTau,
          speedEquivalentFNumber: edgeTau > ZERO_THROUGHPUT && c.peak > 0 ? fNumber * Math.sqrt(c.peak / edgeTau) : null,
        }
      : null;

  const coneBandwidthNm = onAxis.contrast && onAxis.contrast > 0 ? primary.throughput / onAxis.contrast : null;

  return {
    curve,
    nEff: n.value,
    nEffSource: n.source,
    nEffPolarised: input.nEffPolarised ?? null,
    refTempC: ref.value,
    refTempSource: ref.source,
    totalShiftNm,
    lineNm,
    lineId: primary.id === CUSTOM_LINE_ID ? CUSTOM_LINE_ID : primary.id,
    onAxis,
    edge,
    peakT: c.peak,
    fSweep,
    ...(fSweepRange ? { fSweepRange } : {}),
    fieldSweep,
    shiftSweep,
    fwhm0Nm,
    cwl0Nm,
    coneBandwidthNm,
  };
}

export type StudyOutcome = { ok: true; study: CurveStudy } | { ok: false; curve: StudyCurve; error: string };

/** Each curve on its own: one unusable curve (no passband, a bad paste) does not hide the others. */
export function runStudy(curves: StudyCurve[], s: StudySettings): StudyOutcome[] {
  return curves.map((curve) => {
    try {
      return { ok: true, study: studyCurve(curve, s) };
    } catch (e) {
      return { ok: false, curve, error: e instanceof Error ? e.message : String(e) };
    }
  });
}

export interface SetFit {
  curveKey: string;
  label: string;
  points: { aoiDeg: number; cwlNm: number }[];
  nEff: number | null;
  cwl0Nm: number | null;
  rmsResidualNm: number | null;
  /** The fitted λ(θ) = λ0·sqrt(1 − sin²θ/n²) across the measured angles. */
  fitted: Series;
  error?: string;
}

export interface StudyResults {
  outcomes: StudyOutcome[];
  /** Share of the pupil's light per 0.5° of incidence, on axis and at the field edge. */
  histogram: { onAxis: AngleBin[]; edge: AngleBin[] | null; edgeDeg: number };
  explorer: ExplorerGrid | null;
  sets: SetFit[];
  /** Wall time of the computation, ms, for the page's progress note. */
  elapsedMs: number;
}

function setFit(curve: StudyCurve): SetFit | null {
  if (!curve.set || curve.set.length < 2) return null;
  const points = curve.set.map((m) => ({ aoiDeg: m.aoiDeg, cwlNm: m.cwlNm }));
  const base = { curveKey: curve.key, label: curve.label, points };
  try {
    const fit = fitEffectiveIndex(points);
    const maxAoi = Math.max(...points.map((p) => p.aoiDeg), 1);
    const x = range(0, Math.min(60, maxAoi * 1.25), 48);
    return { ...base, nEff: fit.nEff, cwl0Nm: fit.cwl0Nm, rmsResidualNm: fit.rmsResidualNm, fitted: { x, y: x.map((a) => predictCwl(fit.cwl0Nm, fit.nEff, a)) } };
  } catch (e) {
    return { ...base, nEff: null, cwl0Nm: null, rmsResidualNm: null, fitted: { x: [], y: [] }, error: e instanceof Error ? e.message : String(e) };
  }
}

function lineWavelength(s: StudySettings): number {
  const rest = 'id' in s.line ? (findLine(s.line.id)?.airNm ?? 656.28) : s.line.nm;
  return dopplerShift(rest, s.radialVelocityKms);
}

/** The whole study: every curve, the pictures that depend only on the optic, the explorer and the set fits. */
export function computeStudy(curves: StudyCurve[], s: StudySettings): StudyResults {
  const started = typeof performance !== 'undefined' ? performance.now() : Date.now();
  const outcomes = runStudy(curves, s);
  const { fNumber, obstruction, mapping, fieldAngleDeg } = s.optic;
  const onAxisPupil = studyPupil({ fNumber, obstruction, mapping });
  const histogram = {
    onAxis: angleHistogram(onAxisPupil, 0.5),
    edge: fieldAngleDeg > 0 ? angleHistogram(studyPupil({ fNumber, obstruction, mapping, fieldAngleDeg }), 0.5) : null,
    edgeDeg: fieldAngleDeg,
  };

  const ok = outcomes.flatMap((o) => (o.ok ? [o.study] : []));
  const nEff = s.nEff ?? ok[0]?.nEff ?? (curves[0] ? nEffFor(curves[0], s).value : DEFAULT_N_EFF);
  const lineNm = ok[0]?.lineNm ?? lineWavelength(s);
  const markers: ExplorerMarker[] = ok
    .filter((st) => st.fwhm0Nm !== null && st.cwl0Nm !== null)
    .map((st) => ({
      key: st.curve.key,
      label: st.curve.label,
      widthNm: st.fwhm0Nm!,
      shiftNm: st.cwl0Nm! - st.lineNm,
      throughput: st.onAxis.lines[0].throughput,
    }));
  const explorer = explorerGrid(onAxisPupil, nEff, lineNm, markers);

  const sets: SetFit[] = [];
  const seen = new Set<string>();
  for (const c of curves) {
    const fit = setFit(c);
    if (!fit) continue;
    const sig = fit.points.map((p) => `${p.aoiDeg}:${p.cwlNm}`).join('|');
    if (seen.has(sig)) continue;
    seen.add(sig);
    sets.push(fit);
  }
  const ended = typeof performance !== 'undefined' ? performance.now() : Date.now();
  return { outcomes, histogram, explorer, sets, elapsedMs: ended - started };
}
