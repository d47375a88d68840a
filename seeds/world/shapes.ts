/**
 * Closed-form passband shapes and the angle shift used to generate demo curves.
 *
 * Passband: a multi-cavity filter is approximated by the Butterworth-like form
 *   T(λ) = T_peak / (1 + ((λ − λc) / (FWHM/2))^(2m)),  m = number of cavities,
 * which is exactly T_peak/2 at λc ± FWHM/2, times a small in-band ripple, plus an
 * out-of-band blocking floor.
 *
 * Angle: docs/model.md §Angle shift, s(θ) = sqrt(1 − sin²θ / n_eff²), T_θ(λ) = T_0(λ / s(θ)).
 */
import { angleScale as engineAngleScale } from '@/lib/engine/angles';
import type { CurvePoints, PassbandBand } from './types';

export interface PassbandParams {
  bands: PassbandBand[];
  /** relative in-band ripple amplitude (0 = none); 0.005–0.02 looks measured */
  rippleAmplitude?: number;
  /** ripple period in nm */
  ripplePeriodNm?: number;
  /** ripple phase in radians */
  ripplePhase?: number;
  /** out-of-band blocking floor, absolute transmission (e.g. 1e-4–1e-3) */
  blockingFloor?: number;
}

/** The angle scale factor s(θ) of docs/model.md §Angle shift (the engine's), refusing what the demo world never measures. */
export function angleScale(aoiDeg: number, nEff: number): number {
  if (!Number.isFinite(nEff) || nEff < 1 || nEff > 4) {
    throw new RangeError(`effective index ${nEff} is outside 1.0–4.0`);
  }
  if (!Number.isFinite(aoiDeg) || aoiDeg < 0 || aoiDeg >= 90) {
    throw new RangeError(`angle of incidence ${aoiDeg}° is outside [0, 90)`);
  }
  return engineAngleScale(aoiDeg, nEff);
}

/**
 * The noiseless multi-cavity passband as a function of wavelength (nm).
 * Several bands (e.g. a dual-band filter) add; the floor is added everywhere.
 */
export function multiCavityPassband(params: PassbandParams): (wavelengthNm: number) => number {
  const bands = params.bands.map((b) => {
    if (!(b.fwhmNm > 0)) throw new RangeError('FWHM must be positive');
    if (!(b.peakT > 0 && b.peakT <= 1)) throw new RangeError('peak transmission must be in (0, 1]');
    if (!Number.isInteger(b.cavities) || b.cavities < 1) throw new RangeError('cavities must be a positive integer');
    return { c: b.cwlNm, half: b.fwhmNm / 2, peak: b.peakT, twoM: 2 * b.cavities };
  });
  const ripple = params.rippleAmplitude ?? 0;
  const period = params.ripplePeriodNm ?? 1;
  const phase = params.ripplePhase ?? 0;
  const floor = params.blockingFloor ?? 0;
  return (lambda: number): number => {
    let t = floor;
    for (const b of bands) {
      const x = (lambda - b.c) / b.half;
      const shape = 1 / (1 + Math.pow(Math.abs(x), b.twoM));
      // ripple fades out towards the edges (weight shape², 1/4 at half maximum)
      const wobble = ripple === 0 ? 1 : 1 + ripple * shape * shape * Math.sin((2 * Math.PI * (lambda - b.c)) / period + phase);
      t += b.peak * shape * wobble;
    }
    return t;
  };
}

/**
 * Bring a curve measured at normal incidence to the angle aoiDeg (docs/model.md §Angle shift):
 * T_θ(λ) = T_0(λ / s), i.e. the sample (λ, T) of T_0 becomes the sample (λ·s, T)
 * of T_θ. Exact — no resampling; wavelengths stay strictly increasing.
 */
export function applyAngle(points: CurvePoints, aoiDeg: number, nEff: number): CurvePoints {
  if (points.wavelengthNm.length !== points.transmission.length) {
    throw new RangeError('wavelength and transmission arrays differ in length');
  }
  const s = angleScale(aoiDeg, nEff);
  return {
    wavelengthNm: points.wavelengthNm.map((l) => l * s),
    transmission: points.transmission.slice(),
  };
}

/** Round to a number of decimals (half away from zero is not needed for positive data). */
export function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
}

/** An evenly stepped wavelength grid from startNm, count samples, rounded to 3 decimals. */
export function wavelengthGrid(startNm: number, stepNm: number, count: number): number[] {
  const out = new Array<number>(count);
  for (let i = 0; i < count; i++) out[i] = roundTo(startNm + i * stepNm, 3);
  return out;
}
