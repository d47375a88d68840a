/** Synthetic curves and an independent brute-force cone integral for the engine tests. */

import type { CurvePoints, Optic } from '@/lib/engine/types';

export function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

function sample(lo: number, hi: number, step: number, f: (x: number) => number): CurvePoints {
  const n = Math.round((hi - lo) / step) + 1;
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = lo + i * step;
    wavelengthNm.push(x);
    transmission.push(f(x));
  }
  return { wavelengthNm, transmission };
}

export function gaussian(cwl: number, sigma: number, peak = 0.9, step = 0.05, half = 30): CurvePoints {
  return sample(cwl - half, cwl + half, step, (x) => peak * Math.exp(-0.5 * ((x - cwl) / sigma) ** 2));
}

/** Flat top of the given full width with linear edges `edge` nm wide. */
export function flatTop(cwl: number, width: number, edge: number, peak = 0.95, step = 0.05, half = 30): CurvePoints {
  return sample(cwl - half, cwl + half, step, (x) => {
    const d = Math.abs(x - cwl) - width / 2;
    return d <= 0 ? peak : d < edge ? peak * (1 - d / edge) : 0;
  });
}

/**
 * Multi-cavity-like passband: peak / (1 + u^(2m)) with u = 2(λ − cwl)/FWHM, so the
 * half-maximum points sit exactly at cwl ± FWHM/2; optional ripple and noise.
 */
export function multiCavity(cwl: number, fwhm: number, cavities = 3, opts: { peak?: number; ripple?: number; noise?: number; seed?: number; step?: number; half?: number } = {}): CurvePoints {
  const { peak = 0.92, ripple = 0, noise = 0, seed = 1, step = 0.05, half = 30 } = opts;
  const r = rng(seed);
  return sample(cwl - half, cwl + half, step, (x) => {
    const u = (2 * (x - cwl)) / fwhm;
    const t = (peak / (1 + u ** (2 * cavities))) * (1 + ripple * Math.sin(9 * x)) + noise * (r() - 0.5);
    return Math.max(0, t);
  });
}

/**
 * τ by midpoint integration over the pupil, straight from docs/model.md §Angle shift to §Pupil (ray
 * vectors, not the engine's reformulation), using its own uniform-grid lookup.
 * ψ only enters through sin ψ, so ψ ∈ (−π/2, π/2) covers the circle twice over.
 */
export function bruteForceTau(
  points: CurvePoints,
  optic: Optic,
  lambdaNm: number,
  nEff: number,
  opts: { nRho?: number; nPsi?: number; sM?: number; shift?: number } = {},
): number {
  return bruteForceTaus(points, optic, [lambdaNm], nEff, opts)[0];
}

/** The same for several wavelengths in one pass over the pupil. */
export function bruteForceTaus(
  points: CurvePoints,
  optic: Optic,
  lambdas: number[],
  nEff: number,
  opts: { nRho?: number; nPsi?: number; sM?: number; shift?: number } = {},
): number[] {
  const { nRho = 4000, nPsi = 4000, sM = 1, shift = 0 } = opts;
  const x = points.wavelengthNm;
  const y = points.transmission;
  const x0 = x[0];
  const step = x[1] - x[0];
  const last = x.length - 1;
  const T = (v: number) => {
    const f = (v - x0) / step;
    if (f < 0 || f > last) return 0;
    const j = Math.min(last - 1, Math.floor(f));
    const a = f - j;
    return y[j] * (1 - a) + y[j + 1] * a;
  };
  const N = optic.fNumber;
  const eps = optic.obstruction;
  const phi = ((optic.fieldAngleDeg ?? 0) * Math.PI) / 180;
  const sine = optic.mapping === 'sine';
  const sp = Math.sin(phi);
  const cp = Math.cos(phi);
  const n2 = nEff * nEff;
  const halfPsi = phi === 0 ? 1 : nPsi / 2;
  const sinPsiAt = new Float64Array(halfPsi);
  for (let j = 0; j < halfPsi; j++) sinPsiAt[j] = phi === 0 ? 0 : Math.sin(-Math.PI / 2 + (Math.PI * (j + 0.5)) / halfPsi);
  const sums = lambdas.map(() => 0);
  let wsum = 0;
  for (let i = 0; i < nRho; i++) {
    const rho = eps + ((1 - eps) * (i + 0.5)) / nRho;
    for (let j = 0; j < halfPsi; j++) {
      const sinPsi = sinPsiAt[j];
      let dz: number;
      if (!sine) {
        const t = rho / (2 * N);
        const vz = cp - t * sinPsi * sp;
        dz = vz / Math.sqrt(1 + t * t);
      } else {
        const sa = rho / (2 * N);
        dz = cp * Math.sqrt(1 - sa * sa) - sinPsi * sa * sp;
      }
      const s = Math.sqrt(1 - (1 - dz * dz) / n2);
      for (let k = 0; k < lambdas.length; k++) sums[k] += rho * T(sM * (lambdas[k] / s - shift));
      wsum += rho;
    }
  }
  return sums.map((v) => v / wsum);
}
