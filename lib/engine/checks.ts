/**
 * Automatic checks run on every submission before a moderator sees it. They
 * compare the derived numbers with what the contributor declared and flag data
 * that the cone model cannot be trusted on. Pure: the server adds the checks
 * that need the library (such as duplicates).
 */

import { cleanPoints } from './curve';
import { angleScale } from './angles';
import { EngineInputError } from './errors';
import { findLine } from './lines';
import { fitEffectiveIndex } from './neff';
import type { Check, CurvePoints, Metrics } from './types';

export interface CheckMethod {
  instrument?: string;
  resolutionNm?: number;
  beam?: 'collimated' | 'converging';
  beamFNumber?: number;
  aoiDeg?: number;
  temperatureC?: number;
}

export interface CheckMetadata {
  lines?: string[];
  nominalCwlNm?: number;
  nominalFwhmNm?: number;
  declaredPreShiftNm?: number;
  method?: CheckMethod;
}

export interface CheckInput {
  metrics: Metrics;
  metadata?: CheckMetadata;
  /** AOI of this file when it belongs to a set (else metadata.method.aoiDeg). */
  aoiDeg?: number;
  /** Every curve of a multi-angle set, for the set checks (codes starting with "set"). */
  /** The files of a set; `tempC` is a file's own measurement temperature (a multi-temperature set). */
  set?: { aoiDeg: number; tempC?: number; metrics: Metrics }[];
}

/** Tolerances. The CWL and FWHM ones are the brief's; the others are common practice. */
export const CWL_TOLERANCE_NM = 0.5;
export const FWHM_TOLERANCE = 0.15;
export const COVERAGE_FWHMS = 3;
export const PEAK_ERROR_ABOVE = 1.02;
export const PEAK_LOW_BELOW = 0.2;
/**
 * What thin-film physics allows for n_eff: it lies between the low and the high
 * index of the coating's materials (Macleod, Thin-Film Optical Filters, ch. 7:
 * the effective index of a cavity filter falls between its spacer's index and
 * that of the other material). Material indices in the visible, from memory:
 * MgF2 1.38 and SiO2 1.46 (low); Ta2O5 about 2.1, Nb2O5 about 2.3, TiO2 about
 * 2.35–2.4 (high). In the near infrared (beyond 1000 nm) silicon, about 3.5,
 * serves as a high-index layer.
 */
export const NEFF_MATERIAL_LOW = 1.38;
export const NEFF_VISIBLE_HIGH = 2.4;
export const NEFF_NEAR_IR_HIGH = 3.6;
export const NEAR_IR_FROM_NM = 1000;
const NEFF_PLAUSIBLE: [number, number] = [NEFF_MATERIAL_LOW, NEFF_VISIBLE_HIGH];

/** Whether a fitted effective index is physically plausible at this wavelength, and why not. */
export function neffPlausibility(nEff: number, cwlNm: number): { plausible: boolean; reason: string } {
  const high = cwlNm >= NEAR_IR_FROM_NM ? NEFF_NEAR_IR_HIGH : NEFF_VISIBLE_HIGH;
  const where = cwlNm >= NEAR_IR_FROM_NM ? 'in the near infrared (silicon about 3.5)' : 'in the visible (TiO2 about 2.35–2.4)';
  if (nEff < NEFF_MATERIAL_LOW) {
    return { plausible: false, reason: `n_eff ${nEff.toFixed(3)} is below the lowest coating index (MgF2 about 1.38): no thin-film stack shifts this fast with angle, so the AOIs, the CWLs or the files' order are probably wrong.` };
  }
  if (nEff > high) {
    return { plausible: false, reason: `n_eff ${nEff.toFixed(3)} is above the highest coating index ${where}: no thin-film stack shifts this little with angle, so check the declared AOIs (a beam tilt read as degrees too small?) and the CWLs.` };
  }
  return { plausible: true, reason: `n_eff ${nEff.toFixed(3)} lies between the low and high coating indices (${NEFF_MATERIAL_LOW}–${high}).` };
}

const nm = (v: number, d = 2) => `${v.toFixed(d)} nm`;


export function runChecks(input: CheckInput): Check[] {
  const { metrics: m, metadata } = input;
  const method = metadata?.method;
  const aoi = input.aoiDeg ?? method?.aoiDeg ?? 0;
  const checks: Check[] = [];
  const add = (code: string, level: Check['level'], message: string) => checks.push({ code, level, message });

  if (m.cwlNm === null || m.fwhmNm === null) {
    add('passband-undefined', 'error', 'The curve has no half-maximum crossing on at least one side, so CWL and FWHM are undefined; measure a wider range around the passband.');
  } else {
    add('passband', 'info', `Peak ${(m.peakT * 100).toFixed(1)} % at ${nm(m.peakNm)}, CWL ${nm(m.cwlNm)}, FWHM ${nm(m.fwhmNm)}.`);
  }

  if (m.peakT > PEAK_ERROR_ABOVE) {
    add('peak-high', 'error', `Peak transmission ${(m.peakT * 100).toFixed(1)} % is above 102 %; check the baseline or the transmission unit.`);
  } else if (m.peakT > 1) {
    add('peak-high', 'warn', `Peak transmission ${(m.peakT * 100).toFixed(1)} % is slightly above 100 %, which suggests a baseline or noise error.`);
  } else if (m.peakT < PEAK_LOW_BELOW) {
    add('peak-low', 'warn', `Peak transmission ${(m.peakT * 100).toFixed(1)} % is below 20 %; check the unit (percent versus fraction) and the reference beam.`);
  }

  if (m.cwlNm !== null && m.fwhmNm !== null) {
    const nominal = metadata?.nominalCwlNm;
    if (nominal !== undefined && nominal > 0) {
      // at non-normal incidence the passband is expected blueward of nominal
      const lo = nominal * angleScale(aoi, NEFF_PLAUSIBLE[0]) - CWL_TOLERANCE_NM;
      const hi = nominal * angleScale(aoi, NEFF_PLAUSIBLE[1]) + CWL_TOLERANCE_NM;
      const where = aoi > 0 ? ` for a measurement at ${aoi}° AOI (allowing the angle shift)` : '';
      if (m.cwlNm < lo || m.cwlNm > hi) {
        add('cwl-nominal', 'warn', `Measured CWL ${nm(m.cwlNm)} is ${nm(m.cwlNm - nominal)} from the nominal ${nm(nominal)}, more than ${CWL_TOLERANCE_NM} nm${where}.`);
      } else {
        add('cwl-nominal', 'info', `Measured CWL ${nm(m.cwlNm)} agrees with the nominal ${nm(nominal)} within ${CWL_TOLERANCE_NM} nm${where}.`);
      }
    }
    const nominalFwhm = metadata?.nominalFwhmNm;
    if (nominalFwhm !== undefined && nominalFwhm > 0) {
      const rel = (m.fwhmNm - nominalFwhm) / nominalFwhm;
      const text = `Measured FWHM ${nm(m.fwhmNm)} is ${(rel * 100).toFixed(0)} % from the nominal ${nm(nominalFwhm)}`;
      if (Math.abs(rel) > FWHM_TOLERANCE) add('fwhm-nominal', 'warn', `${text}, beyond ±15 %.`);
      else add('fwhm-nominal', 'info', `${text}, within ±15 %.`);
    }

    const need: [number, number] = [m.cwlNm - COVERAGE_FWHMS * m.fwhmNm, m.cwlNm + COVERAGE_FWHMS * m.fwhmNm];
    if (m.rangeNm[0] > need[0] || m.rangeNm[1] < need[1]) {
      add('coverage', 'warn', `The measured range ${nm(m.rangeNm[0], 1)}–${nm(m.rangeNm[1], 1)} does not cover CWL ± 3·FWHM (${nm(need[0], 1)}–${nm(need[1], 1)}); the cone model treats the missing part as zero transmission.`);
    } else {
      add('coverage', 'info', 'The measured range covers the passband and CWL ± 3·FWHM.');
    }

    const step = m.medianStepNm;
    if (step > m.fwhmNm / 5) {
      add('sampling-fwhm', 'warn', `The median sample step ${nm(step, 3)} is more than a fifth of the FWHM; the passband shape is coarsely sampled.`);
    }
    const res = method?.resolutionNm;
    if (res !== undefined && res > m.fwhmNm / 5) {
      add('resolution', 'warn', `The declared resolution ${nm(res, 3)} is more than a fifth of the FWHM, so the measured passband is broadened by the instrument.`);
    }
  }

  const res = method?.resolutionNm;
  if (res !== undefined && res > 0) {
    if (m.medianStepNm > res * 1.0001) {
      add('sampling', 'warn', `The median sample step ${nm(m.medianStepNm, 3)} is coarser than the declared resolution ${nm(res, 3)}: the curve is undersampled.`);
    } else {
      add('sampling', 'info', `The median sample step ${nm(m.medianStepNm, 3)} is within the declared resolution ${nm(res, 3)}.`);
    }
  }

  for (const id of metadata?.lines ?? []) {
    const line = findLine(id);
    if (!line) continue;
    if (line.airNm < m.rangeNm[0] || line.airNm > m.rangeNm[1]) {
      add('line-coverage', 'warn', `The target line ${line.name} (${line.airNm} nm) lies outside the measured range.`);
    }
  }

  if (method?.beam === 'converging') {
    if (method.beamFNumber === undefined) {
      add('beam-fnumber', 'error', 'The beam was converging but its f-number is missing; the cone itself shifts and widens a measured passband.');
    } else {
      add('beam-fnumber', 'info', `Measured in a converging f/${method.beamFNumber} beam: the curve already includes that cone's broadening.`);
    }
  }

  if (input.set) checks.push(...setChecks(input.set));
  return checks;
}

function setChecks(set: { aoiDeg: number; tempC?: number; metrics: Metrics }[]): Check[] {
  const out: Check[] = [];
  const usable = set.filter((s) => s.metrics.cwlNm !== null);
  if (usable.length < set.length) {
    out.push({ code: 'set-cwl', level: 'warn', message: `${set.length - usable.length} curve(s) of the set have no CWL and are left out of the effective-index fit.` });
  }
  const angles = new Set(usable.map((s) => s.aoiDeg));
  if (angles.size < 2 && new Set(usable.map((s) => s.tempC).filter((t) => t !== undefined)).size >= 2) {
    // one angle, several temperatures: a temperature set, which fits dCWL/dT instead (lib/engine/temperature.ts)
    out.push({ code: 'set-angles', level: 'info', message: 'The set is at one angle and several temperatures: it gives dCWL/dT rather than an effective index.' });
    return out;
  }
  if (angles.size < 2) {
    out.push({ code: 'set-angles', level: 'warn', message: 'The set needs CWLs at two or more different AOIs to fit an effective index.' });
    return out;
  }
  try {
    const fit = fitEffectiveIndex(usable.map((s) => ({ aoiDeg: s.aoiDeg, cwlNm: s.metrics.cwlNm as number })));
    const text = `Effective index ${fit.nEff.toFixed(3)} fitted from ${usable.length} angles (normal-incidence CWL ${nm(fit.cwl0Nm)}, RMS residual ${nm(fit.rmsResidualNm, 3)}).`;
    if (fit.nEff < 1 || fit.nEff > 4) {
      out.push({ code: 'set-neff', level: 'warn', message: `${text} That is outside 1.0–4.0, the range the model accepts.` });
    } else {
      out.push({ code: 'set-neff', level: 'info', message: text });
      const p = neffPlausibility(fit.nEff, fit.cwl0Nm);
      out.push({ code: 'set-neff-physical', level: p.plausible ? 'info' : 'warn', message: p.reason });
    }
  } catch (e) {
    if (!(e instanceof EngineInputError)) throw e;
    out.push({ code: 'set-direction', level: 'error', message: e.message });
  }
  return out;
}

/** Significant digits kept in the canonical text, so unit conversions hash alike. */
const CANONICAL_DIGITS = 10;

/**
 * Canonical text of a curve's points (cleaned, ascending, fixed precision) for
 * duplicate detection; the server hashes it with SHA-256.
 */
export function normalisedPointsHash(points: CurvePoints): string {
  const { points: p } = cleanPoints(points);
  const fmt = (v: number) => String(Number(v.toPrecision(CANONICAL_DIGITS)));
  const rows = new Array<string>(p.wavelengthNm.length);
  for (let i = 0; i < rows.length; i++) rows[i] = `${fmt(p.wavelengthNm[i])},${fmt(p.transmission[i])}`;
  return `bandcone-points-v1\n${rows.join('\n')}\n`;
}
