/**
 * Shared shapes. Wavelengths are nm in standard air and transmission a fraction
 * 0–1 everywhere inside the engine; angles are degrees at this boundary and
 * radians inside the model code.
 */

/** A curve as the API carries it: parallel arrays, nm ascending, fraction. */
export interface CurvePoints {
  wavelengthNm: number[];
  transmission: number[];
}

export type Mapping = 'tangent' | 'sine';

export interface Optic {
  /** Working f-number N (≥ 0.5). */
  fNumber: number;
  /** Central obstruction ratio ε = obstruction diameter / aperture diameter, 0 ≤ ε < 1. */
  obstruction: number;
  /** Chief-ray angle at the filter for the field point, degrees (0 on axis). */
  fieldAngleDeg?: number;
  /** How pupil radius maps to ray angle; "tangent" unless the optic is aplanatic. */
  mapping?: Mapping;
}

export interface LineMetric {
  id: string;
  wavelengthNm: number;
  transmission: number;
  /** False when the line lies outside the measured range (transmission then reads 0). */
  covered: boolean;
}

export interface Metrics {
  peakT: number;
  peakNm: number;
  leftNm: number | null;
  rightNm: number | null;
  cwlNm: number | null;
  fwhmNm: number | null;
  meanInBandT: number | null;
  effectiveBandwidthNm: number | null;
  blockingOd: number | null;
  rangeNm: [number, number];
  /** Number of samples after clean-up. */
  sampleCount: number;
  /** Median spacing between neighbouring samples, nm. */
  medianStepNm: number;
  lines: LineMetric[];
  warnings: string[];
}

export type CheckLevel = 'info' | 'warn' | 'error';

export interface Check {
  code: string;
  level: CheckLevel;
  message: string;
}

export interface AngleBin {
  /** Centre of the incidence-angle bin, degrees. */
  deg: number;
  /** Fraction of the pupil's light in this bin (all bins sum to 1). */
  weight: number;
}

/** How the design passband is moved before the cone acts on it (docs/model.md §Angle shift and §Pre-shift). */
export interface ShiftParams {
  nEff: number;
  /** Separate s and p indices of a set measured in polarised light; the cone then averages the two (docs/model.md §Polarised sets). */
  nEffPolarised?: { s: number; p: number };
  measuredAoiDeg?: number;
  preShiftNm?: number;
  tempCoeffNmPerC?: number;
  tempC?: number;
  refTempC?: number;
}

/** Body of POST /api/model/cone once `curveId` has been resolved to points. */
export interface ConeModelInput extends ShiftParams {
  points: CurvePoints;
  optic: Optic;
  lines?: string[];
  lineNm?: number;
  radialVelocityKms?: number;
  includeCurve?: boolean;
  /** Redshift, instead of radialVelocityKms: every line moves to λ₀·(1 + z). */
  z?: number;
  /** Count fixed-ratio doublets ([O III], [N II]) together in the target total. */
  doublets?: boolean;
  /** Relative strength of each target line in the total (default 1 each). */
  lineWeights?: Record<string, number>;
  /** Sky lines, continuum and contrast gain (lib/engine/sky.ts). */
  sky?: import('./sky').SkyRequest;
  /** Standard uncertainty of the curve's wavelength scale, nm: gives each line a throughputRange. */
  wavelengthUncertaintyNm?: number;
  /** Uncertainty of n_eff (of a fitted set): widens the ranges. */
  nEffUncertainty?: number;
}

export interface ConeLineResult {
  id: string;
  wavelengthNm: number;
  collimated: number;
  throughput: number;
  /** null stands for an infinite f-number (no line signal at all). */
  speedEquivalentFNumber: number | null;
  /** Lowest and highest throughput within the wavelength and n_eff uncertainties (when given). */
  throughputRange?: [number, number];
  /** Speed-equivalent f-numbers at the two ends of throughputRange (null: infinite). */
  speedEquivalentRange?: [number | null, number | null];
}

export interface NeighbourResult {
  id: string;
  wavelengthNm: number;
  collimated: number;
  throughput: number;
}

/** Response of POST /api/model/cone. */
export interface ConeModelResult {
  lines: ConeLineResult[];
  bestPreShift: { nm: number; throughput: number; nmRange?: [number, number] } | null;
  neighbours: NeighbourResult[];
  contrast: number | null;
  angleHistogram: AngleBin[];
  coneCurve?: CurvePoints;
  warnings: string[];
  /** Present when the request asked for a sky. */
  sky?: import('./sky').SkyStudy;
  /** Each target line with its weight, and their weighted total (z, doublets, several lines or weights given). */
  target?: TargetTotal;
}

export interface TargetTotal {
  /** The redshift applied (z, or v/c from radialVelocityKms). */
  z: number;
  lines: { id: string; wavelengthNm: number; weight: number; throughput: number; fromDoublet: boolean }[];
  /** Σ wᵢ τᵢ / Σ wᵢ. */
  total: number | null;
}
