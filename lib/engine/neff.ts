/**
 * Effective index from one filter measured at several AOIs (docs/model.md §Effective index):
 * with λ(θ) = λ0·sqrt(1 − sin²θ/n²), λ² is linear in sin²θ,
 *   λ² = a + b·sin²θ,  λ0 = sqrt(a),  n_eff = sqrt(−a/b).
 */

import { EngineInputError, type InputDetail } from './errors';
import { angleScale, DEG } from './angles';

export interface AngleCwl {
  aoiDeg: number;
  cwlNm: number;
}

export interface NeffFit {
  nEff: number;
  /**
   * Standard error of n_eff from the fit's scatter, or null with fewer than three curves.
   * With s² = Σr²/(m − 2) the residual variance of λ² and S = Σ(x − x̄)²:
   *   var b = s²/S,  var a = s²·(1/m + x̄²/S),  cov(a, b) = −x̄·s²/S,
   * and n = sqrt(−a/b) carries them to first order (∂n/∂a = −1/(2nb), ∂n/∂b = a/(2nb²)).
   */
  nEffStdErr: number | null;
  cwl0Nm: number;
  rmsResidualNm: number;
  points: { aoiDeg: number; cwlNm: number; fittedNm: number; residualNm: number }[];
}

/** What POST /api/model/neff answers. */
export type NeffAnswer = Pick<NeffFit, 'nEff' | 'cwl0Nm' | 'rmsResidualNm'>;

export function predictCwl(cwl0Nm: number, nEff: number, aoiDeg: number): number {
  return cwl0Nm * angleScale(aoiDeg, nEff);
}

export function fitEffectiveIndex(measurements: AngleCwl[]): NeffFit {
  if (!Array.isArray(measurements) || measurements.length === 0) {
    throw new EngineInputError('Give CWLs measured at two or more angles.', [{ field: 'measurements', message: 'no measurements' }]);
  }
  const details: InputDetail[] = [];
  measurements.forEach((m, i) => {
    if (typeof m?.aoiDeg !== 'number' || !Number.isFinite(m.aoiDeg) || m.aoiDeg < 0 || m.aoiDeg >= 90) {
      details.push({ field: 'aoiDeg', index: i, message: 'AOI must be between 0 and 90 degrees' });
    }
    if (typeof m?.cwlNm !== 'number' || !Number.isFinite(m.cwlNm) || m.cwlNm <= 0) {
      details.push({ field: 'cwlNm', index: i, message: 'CWL must be a positive number of nm' });
    }
  });
  if (details.length > 0) throw new EngineInputError(`Measurement ${details[0].index}: ${details[0].message}.`, details);

  const xs = measurements.map((m) => Math.sin(m.aoiDeg * DEG) ** 2);
  const ys = measurements.map((m) => m.cwlNm * m.cwlNm);
  const distinct = new Set(measurements.map((m) => m.aoiDeg)).size;
  if (distinct < 2) {
    throw new EngineInputError('The effective index needs curves measured at two or more different angles.', [
      { field: 'measurements', message: `only ${distinct} distinct AOI` },
    ]);
  }
  const n = xs.length;
  const mx = xs.reduce((s, v) => s + v, 0) / n;
  const my = ys.reduce((s, v) => s + v, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  const b = sxy / sxx;
  const a = my - b * mx;
  if (!(b < 0)) {
    throw new EngineInputError('These curves do not move blueward with angle, so no effective index can be fitted.', [
      { field: 'measurements', message: 'CWL does not fall as the AOI grows (fitted slope b ≥ 0)' },
    ]);
  }
  if (!(a > 0)) {
    throw new EngineInputError('The fitted normal-incidence CWL is not real; check the angles and CWLs.', [
      { field: 'measurements', message: 'fitted intercept a ≤ 0' },
    ]);
  }
  const cwl0Nm = Math.sqrt(a);
  const nEff = Math.sqrt(-a / b);
  let ss = 0;
  const points = measurements.map((m, i) => {
    const fittedNm = Math.sqrt(Math.max(0, a + b * xs[i]));
    const residualNm = m.cwlNm - fittedNm;
    ss += residualNm * residualNm;
    return { aoiDeg: m.aoiDeg, cwlNm: m.cwlNm, fittedNm, residualNm };
  });
  let nEffStdErr: number | null = null;
  if (n >= 3) {
    let ssy = 0;
    for (let i = 0; i < n; i++) ssy += (ys[i] - (a + b * xs[i])) ** 2;
    const s2 = ssy / (n - 2);
    const varB = s2 / sxx;
    const varA = s2 * (1 / n + (mx * mx) / sxx);
    const cov = (-mx * s2) / sxx;
    const dA = -1 / (2 * nEff * b);
    const dB = a / (2 * nEff * b * b);
    const v = dA * dA * varA + dB * dB * varB + 2 * dA * dB * cov;
    nEffStdErr = Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : null;
  }
  return { nEff, nEffStdErr, cwl0Nm, rmsResidualNm: Math.sqrt(ss / n), points };
}

/**
 * Separate s and p effective indices from a set measured in polarised light
 * (docs/model.md §Polarised sets). Off normal incidence a thin-film passband
 * splits: s and p light each follow λ(θ) = λ0·sqrt(1 − sin²θ/n_eff,pol²) with an
 * index of their own. Each polarisation is fitted as above from its own curves;
 * a curve at normal incidence (where s and p coincide) counts for both.
 * Returns null unless s and p each have curves at two or more angles.
 */
export type MeasuredPolarisation = 's' | 'p' | 'unpolarized';

export interface PolarisedFit {
  s: NeffFit;
  p: NeffFit;
}

/** Below this AOI a curve counts as normal incidence, where s and p are the same light. */
const NORMAL_AOI_DEG = 0.5;

export function fitPolarisedIndices(measurements: (AngleCwl & { polarization?: MeasuredPolarisation })[]): PolarisedFit | null {
  const of = (pol: 's' | 'p') => measurements.filter((m) => m.polarization === pol || m.aoiDeg < NORMAL_AOI_DEG);
  const s = of('s');
  const p = of('p');
  const angles = (l: AngleCwl[]) => new Set(l.map((m) => m.aoiDeg)).size;
  if (!measurements.some((m) => m.polarization === 's') || !measurements.some((m) => m.polarization === 'p')) return null;
  if (angles(s) < 2 || angles(p) < 2) return null;
  return { s: fitEffectiveIndex(s), p: fitEffectiveIndex(p) };
}
