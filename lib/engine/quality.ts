/**
 * How good is this measurement? A per-curve assessment from its declared method
 * and its own numbers, shown to moderators at review and to everyone on the
 * curve page. Each item passes, warns or fails with one sentence.
 *
 * 1. Spectral bandwidth (SBW, the declared resolution) against FWHM. Common
 *    practice in spectrophotometry: SBW/FWHM ≤ 0.1 keeps the peak error near
 *    0.5 %. For a Gaussian passband seen through a Gaussian slit the widths add
 *    in quadrature, FWHM_meas = sqrt(FWHM² + SBW²), so the width is overstated
 *    by about SBW²/(2·FWHM) (from memory; any bell-shaped pair behaves alike).
 * 2. Sampling step against FWHM: at least 10 samples across the FWHM pass, 5
 *    warn, fewer fail (common practice).
 * 3. Measuring beam. A curve measured in a converging f/N beam is itself
 *    cone-averaged: its passband sits to the blue and is wider. The engine
 *    estimates the bias by applying that same f/N cone to the measured curve:
 *    bias ≈ CWL(cone of the measured curve) − CWL(measured curve), to first order
 *    the same shift the beam gave the true curve; the offered correction moves
 *    the curve by −bias (toward the red).
 * 4. Wavelength-scale calibration: the declared uncertainty, else a default by
 *    instrument type (stated as a default), against the FWHM.
 * 5. Temperature: stated or not, and how far from room temperature, with the
 *    drift it implies at the coating's coefficient.
 */

import { coneCurve } from './cone';
import type { Instrument } from './limits';
import { computeMetrics } from './metrics';
import { buildPupil } from './pupil';
import type { CurvePoints, Metrics } from './types';

export type QualityLevel = 'pass' | 'warn' | 'fail';

export interface QualityItem {
  code: 'bandwidth' | 'sampling' | 'beam' | 'calibration' | 'temperature';
  level: QualityLevel;
  message: string;
  /** For a converging beam: the shift, nm toward the red, that undoes the beam's blue bias. */
  correctionNm?: number;
}

export interface QualityMethod {
  instrument?: string;
  resolutionNm?: number;
  beam?: 'collimated' | 'converging';
  beamFNumber?: number;
  temperatureC?: number;
  /** Declared wavelength-scale uncertainty, nm (standard uncertainty). */
  wavelengthUncertaintyNm?: number;
}

export interface QualityInput {
  metrics: Pick<Metrics, 'cwlNm' | 'fwhmNm' | 'medianStepNm'>;
  method: QualityMethod;
  points?: CurvePoints;
  /** Effective index for the beam bias (fitted, else the catalogue default). */
  nEff: number;
  /** dCWL/dT of the coating, nm/°C, for the temperature sentence (a default when not known). */
  tempCoeffNmPerC?: number;
}

/** SBW/FWHM at or below this passes (common practice: peak error near 0.5 %). */
export const SBW_RATIO_PASS = 0.1;
export const SBW_RATIO_WARN = 0.25;
/** Step/FWHM: 10 samples across the FWHM pass, 5 warn (common practice). */
export const STEP_RATIO_PASS = 0.1;
export const STEP_RATIO_WARN = 0.2;
/** Calibration uncertainty / FWHM. */
export const CALIBRATION_RATIO_PASS = 0.05;
export const CALIBRATION_RATIO_WARN = 0.15;
/** Beam bias / FWHM below which the beam passes, and above which it fails. */
export const BEAM_RATIO_PASS = 0.05;
export const BEAM_RATIO_FAIL = 0.5;
export const ROOM_TEMP_RANGE_C: [number, number] = [15, 30];

/**
 * Wavelength-accuracy defaults by instrument type, nm. Defaults, not measured
 * values (common practice for instruments of each kind): a double-beam
 * spectrophotometer ±0.3 nm; a spectrograph calibrated on lamp lines 0.05 nm; a
 * scanning monochromator 0.2 nm; anything else 0.5 nm.
 */
export const DEFAULT_WAVELENGTH_UNCERTAINTY_NM: Record<string, number> = {
  spectrophotometer: 0.3,
  spectrograph: 0.05,
  monochromator: 0.2,
  other: 0.5,
} satisfies Record<Instrument, number>;

const nm = (v: number, d = 2) => `${v.toFixed(d)} nm`;

/** The wavelength-scale uncertainty of a stored method: the declared one, else the instrument's default (and which). */
export function wavelengthUncertaintyOf(method: Record<string, unknown>): { nm: number; declared: boolean } {
  const d = method.wavelengthUncertaintyNm;
  if (typeof d === 'number' && Number.isFinite(d) && d > 0) return { nm: d, declared: true };
  const inst = typeof method.instrument === 'string' ? method.instrument : 'other';
  return { nm: DEFAULT_WAVELENGTH_UNCERTAINTY_NM[inst] ?? DEFAULT_WAVELENGTH_UNCERTAINTY_NM.other, declared: false };
}

/** The CWL shift a converging f/N measuring beam gave the curve (negative: to the blue), or null. */
export function convergingBeamBiasNm(points: CurvePoints, fNumber: number, nEff: number): number | null {
  const before = computeMetrics(points);
  if (before.cwlNm === null) return null;
  const pupil = buildPupil({ fNumber, obstruction: 0 });
  const lo = before.rangeNm[0];
  const hi = before.rangeNm[1];
  const step = Math.max(before.medianStepNm, (hi - lo) / 20000);
  const grid: number[] = [];
  for (let l = lo; l <= hi; l += step) grid.push(l);
  const cone = coneCurve(points, pupil, { nEff }, grid);
  const after = computeMetrics(cone);
  if (after.cwlNm === null) return null;
  return after.cwlNm - before.cwlNm;
}

export function assessQuality(q: QualityInput): QualityItem[] {
  const { metrics: m, method } = q;
  const out: QualityItem[] = [];
  const fwhm = m.fwhmNm;

  const sbw = method.resolutionNm;
  if (sbw === undefined || !(sbw > 0)) {
    out.push({ code: 'bandwidth', level: 'warn', message: 'No spectral bandwidth (resolution) was declared, so its effect on the measured width and peak cannot be judged.' });
  } else if (fwhm === null || !(fwhm > 0)) {
    out.push({ code: 'bandwidth', level: 'fail', message: `The curve has no FWHM, so the declared ${nm(sbw)} bandwidth cannot be compared with it.` });
  } else {
    const r = sbw / fwhm;
    const widened = Math.sqrt(fwhm * fwhm + sbw * sbw) - fwhm;
    const text = `Spectral bandwidth ${nm(sbw)} is ${r.toFixed(2)} of the ${nm(fwhm)} FWHM`;
    if (r <= SBW_RATIO_PASS) out.push({ code: 'bandwidth', level: 'pass', message: `${text}: within the usual SBW/FWHM ≤ 0.1 (common practice), so the peak is read within about 0.5 %.` });
    else if (r <= SBW_RATIO_WARN) out.push({ code: 'bandwidth', level: 'warn', message: `${text}, above the usual 0.1: the measured FWHM may be about ${nm(widened, 3)} too wide and the peak a little low.` });
    else out.push({ code: 'bandwidth', level: 'fail', message: `${text}: the instrument smears the passband; the FWHM may be about ${nm(widened, 2)} too wide and the peak clearly low.` });
  }

  if (fwhm === null || !(fwhm > 0)) {
    out.push({ code: 'sampling', level: 'fail', message: 'The curve has no FWHM, so its sampling cannot be judged against it.' });
  } else {
    const step = m.medianStepNm;
    const per = fwhm / step;
    const text = `Samples every ${nm(step, 3)}, ${per.toFixed(0)} across the FWHM`;
    if (step <= STEP_RATIO_PASS * fwhm) out.push({ code: 'sampling', level: 'pass', message: `${text}: enough to trace the passband's shape.` });
    else if (step <= STEP_RATIO_WARN * fwhm) out.push({ code: 'sampling', level: 'warn', message: `${text}: fewer than 10, so the edges and the CWL are read between samples.` });
    else out.push({ code: 'sampling', level: 'fail', message: `${text}: fewer than 5, too coarse to trace the passband.` });
  }

  if (method.beam === 'converging') {
    const fN = method.beamFNumber;
    const bias = fN && q.points && fwhm ? convergingBeamBiasNm(q.points, fN, q.nEff) : null;
    if (!fN) {
      out.push({ code: 'beam', level: 'fail', message: 'Measured in a converging beam of unknown f-number: the curve is cone-averaged by an unknown amount.' });
    } else if (bias === null || !fwhm) {
      out.push({ code: 'beam', level: 'warn', message: `Measured in a converging f/${fN} beam; its bias could not be estimated because the curve has no FWHM.` });
    } else {
      const r = Math.abs(bias) / fwhm;
      const correctionNm = Number((-bias).toFixed(3));
      const text = `Measured in a converging f/${fN} beam, which moves the passband about ${nm(Math.abs(bias), 3)} to the blue (engine estimate at n_eff ${q.nEff.toFixed(2)})`;
      const offer = `; shifting the curve ${nm(correctionNm, 3)} to the red corrects the CWL to first order`;
      if (r <= BEAM_RATIO_PASS) out.push({ code: 'beam', level: 'pass', message: `${text}, small against the FWHM${offer}.`, correctionNm });
      else if (r <= BEAM_RATIO_FAIL) out.push({ code: 'beam', level: 'warn', message: `${text}, ${(r * 100).toFixed(0)} % of the FWHM${offer}; the width is also slightly overstated.`, correctionNm });
      else out.push({ code: 'beam', level: 'fail', message: `${text}, ${(r * 100).toFixed(0)} % of the FWHM: the curve is far from the collimated passband${offer}, but its shape is not recovered.`, correctionNm });
    }
  } else if (method.beam === 'collimated') {
    out.push({ code: 'beam', level: 'pass', message: 'Measured in a collimated beam: no cone bias.' });
  } else {
    out.push({ code: 'beam', level: 'warn', message: 'The measuring beam is not stated; a converging beam would have moved the passband to the blue.' });
  }

  const declared = method.wavelengthUncertaintyNm;
  const inst = method.instrument ?? 'other';
  const u = declared !== undefined && declared > 0 ? declared : (DEFAULT_WAVELENGTH_UNCERTAINTY_NM[inst] ?? DEFAULT_WAVELENGTH_UNCERTAINTY_NM.other);
  const source = declared !== undefined && declared > 0 ? 'declared' : `the default for a ${inst} (not declared)`;
  if (fwhm === null || !(fwhm > 0)) {
    out.push({ code: 'calibration', level: 'warn', message: `Wavelength scale uncertain by ±${nm(u)} (${source}); no FWHM to compare with.` });
  } else {
    const r = u / fwhm;
    const text = `Wavelength scale uncertain by ±${nm(u)} (${source}), ${(r * 100).toFixed(0)} % of the FWHM`;
    if (r <= CALIBRATION_RATIO_PASS) out.push({ code: 'calibration', level: 'pass', message: `${text}: line throughputs move little within it.` });
    else if (r <= CALIBRATION_RATIO_WARN) out.push({ code: 'calibration', level: 'warn', message: `${text}: a line near an edge can move by several points within it.` });
    else out.push({ code: 'calibration', level: 'fail', message: `${text}: the CWL is too uncertain for a narrowband verdict near the edges.` });
  }

  const t = method.temperatureC;
  const k = q.tempCoeffNmPerC;
  if (t === undefined) {
    out.push({ code: 'temperature', level: 'warn', message: `The measurement temperature is not stated${k ? `; at ${k} nm/°C a 10 °C difference moves the CWL ${nm(Math.abs(k) * 10, 3)}` : ''}.` });
  } else if (t >= ROOM_TEMP_RANGE_C[0] && t <= ROOM_TEMP_RANGE_C[1]) {
    out.push({ code: 'temperature', level: 'pass', message: `Measured at ${t.toFixed(1)} °C, room temperature.` });
  } else {
    out.push({ code: 'temperature', level: 'warn', message: `Measured at ${t.toFixed(1)} °C, away from room temperature${k ? `: at ${k} nm/°C the CWL there differs from 20 °C by ${nm(Math.abs(k * (t - 20)), 3)}` : ''}; use the study's temperature to compare.` });
  }
  return out;
}

/** The assessment of a stored curve from its points and method (the numbers are computed here, as the catalogue stores them). */
export function assessCurveQuality(points: CurvePoints, method: Record<string, unknown>, nEff: number, tempCoeffNmPerC?: number): QualityItem[] {
  const num = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : undefined);
  const m = computeMetrics(points);
  return assessQuality({
    metrics: m,
    points,
    nEff,
    tempCoeffNmPerC,
    method: {
      instrument: typeof method.instrument === 'string' ? method.instrument : undefined,
      resolutionNm: num(method.resolutionNm),
      beam: method.beam === 'converging' || method.beam === 'collimated' ? method.beam : undefined,
      beamFNumber: num(method.beamFNumber),
      temperatureC: num(method.temperatureC),
      wavelengthUncertaintyNm: num(method.wavelengthUncertaintyNm),
    },
  });
}
