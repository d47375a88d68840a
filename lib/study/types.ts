/**
 * Shapes of a cone study: the curves chosen, the settings typed, and what the
 * engine answers for each curve. Pure data, shared by the page, the helpers and
 * the tests.
 */

import type { ConeModelResult, CurvePoints, Mapping } from '@/lib/engine/types';

/** A curve in a study: from the catalogue by id, or pasted and read in the browser (never stored). */
export interface StudyCurve {
  /** Stable key in the page: `c<id>` for a catalogue curve, `p<n>` for a pasted one. */
  key: string;
  id: number | null;
  label: string;
  source: 'catalogue' | 'pasted';
  status: string | null;
  lines: string[];
  /** The angle the curve was measured at. */
  aoiDeg: number;
  /** The effective index fitted from the curve's set, when it belongs to one. */
  nEff: number | null;
  /** s and p indices of a set measured in polarised light: the cone averages the two (docs/model.md §Polarised sets). */
  nEffPolarised?: { s: number; p: number } | null;
  /** The temperature recorded with the measurement, °C. */
  tempC: number | null;
  /** Declared coating (sets the default dCWL/dT); absent for pasted curves. */
  coating?: import('@/lib/engine/temperature').Coating | null;
  /** dCWL/dT fitted from the unit measured at several temperatures, nm/°C. */
  tempCoeffNmPerC?: number | null;
  /** Wavelength-scale uncertainty, nm, and whether it was declared or is the instrument's default (error bars). */
  wavelengthUncertainty?: { nm: number; declared: boolean } | null;
  cwlNm: number | null;
  fwhmNm: number | null;
  peakT: number;
  points: CurvePoints;
  /** Every unit of the same set that the reader may see, for the CWL-against-AOI picture. */
  set: { curveId: number; aoiDeg: number; cwlNm: number }[] | null;
}

export interface StudyOptic {
  id: number | null;
  name: string;
  fNumber: number;
  obstruction: number;
  /** Chief-ray angle at the field edge, degrees. */
  fieldAngleDeg: number;
  mapping: Mapping;
}

export type TargetLine = { id: string } | { nm: number };

export interface StudySettings {
  optic: StudyOptic;
  /** Typed effective index; null uses each curve's fitted value, else DEFAULT_N_EFF. */
  nEff: number | null;
  preShiftNm: number;
  tempC: number | null;
  tempCoeffNmPerC: number | null;
  /** Typed reference temperature; null uses the curve's measurement temperature, else 20 °C. */
  refTempC: number | null;
  line: TargetLine;
  radialVelocityKms: number;
  /** The line throughput the user needs (0–1), or null; the verdict says when the error bar straddles it. */
  neededThroughput?: number | null;
}

export interface Series {
  x: number[];
  y: number[];
}

export type NeffSource = 'typed' | 'fitted' | 'default';

/** Everything the page shows for one curve. */
export interface CurveStudy {
  curve: StudyCurve;
  nEff: number;
  nEffSource: NeffSource;
  /** The s and p indices the cone used, when the curve's set was measured in polarised light and no n_eff was typed. */
  nEffPolarised: { s: number; p: number } | null;
  refTempC: number;
  refTempSource: 'typed' | 'measured' | 'default';
  /** Pre-shift plus temperature shift, nm toward the red. */
  totalShiftNm: number;
  /** The target line after the source's radial velocity, nm. */
  lineNm: number;
  lineId: string;
  /** The model on axis: exactly what POST /api/model/cone answers (with includeCurve). */
  onAxis: ConeModelResult;
  /** Line throughput at the field edge, when the optic has a chief-ray angle (what the model gives with optic.fieldAngleDeg). */
  edge: { fieldAngleDeg: number; throughput: number; speedEquivalentFNumber: number | null } | null;
  /** Peak transmission of the measured curve. */
  peakT: number;
  /** Line throughput against f-number, f/1–f/10, on axis with this obstruction. */
  fSweep: Series;
  /** Its lower and upper edge within the curve's wavelength-scale uncertainty (the error band). */
  fSweepRange?: { low: number[]; high: number[]; uncertaintyNm: number };
  /** Line throughput against the chief-ray angle, centre to edge. */
  fieldSweep: Series;
  /** Line throughput against pre-shift over the searched range. */
  shiftSweep: Series;
  /** The curve's FWHM at normal incidence, nm (null when undefined). */
  fwhm0Nm: number | null;
  /** The passband centre at normal incidence including pre-shift and temperature, nm. */
  cwl0Nm: number | null;
  /** Effective bandwidth of the cone-averaged curve, nm (the contrast figure's denominator). */
  coneBandwidthNm: number | null;
}
