/**
 * How far the first-order cone model is from the exact one, for real
 * multi-cavity stacks (docs/model-limits.md). For a design and an optic:
 *
 *   exact:        τ_x(λ) = Σ_k w_k · ½[T_s(λ, θ_k) + T_p(λ, θ_k)]
 *                 the characteristic-matrix transmission of the stack (thin-film.ts)
 *                 averaged over the optic's pupil bins (pupil.ts; θ_k at each bin's
 *                 middle in sin²θ, w_k its exact weight), s and p in equal parts;
 *   first order:  τ_1(λ) = the engine's cone model (cone.ts) applied to the stack's own
 *                 normal-incidence curve, with the effective index fitted from the
 *                 stack's CWL at 0–20° as a lab would fit a multi-angle set (neff.ts).
 *
 * Over the wavelengths where the exact cone-averaged passband is at least half
 * its peak (where a line would be put), `over` is the largest τ_1 − τ_x and
 * `under` the largest τ_x − τ_1, both in percentage points; `atBest` is τ_1 − τ_x
 * at the wavelength the first-order model rates best (its best pre-shift).
 */

import { angleScaleOfSin2, DEG } from './angles';
import { coneCurve } from './cone';
import { computeMetrics } from './metrics';
import { fitEffectiveIndex } from './neff';
import { buildPupil, type Pupil } from './pupil';
import { parseDesign, unpolarisedT, type DesignIndices, type Stack } from './thin-film';
import type { Optic } from './types';

export interface DesignCase {
  /** Layer formula, e.g. "(HL)^4 2H (LH)^4 L (HL)^4 2H (LH)^4". */
  formula: string;
  lambda0Nm: number;
  indices: DesignIndices;
}

export interface DesignSummary {
  formula: string;
  stack: Stack;
  fwhmNm: number;
  cwlNm: number;
  peakT: number;
  nEff: number;
  /** The normal-incidence curve, finely sampled. */
  normal: { wavelengthNm: number[]; transmission: number[] };
}

export interface FirstOrderGap {
  over: number;
  under: number;
  atBest: number;
}

const FIT_ANGLES = [0, 5, 10, 15, 20];

function sampled(stack: Stack, lo: number, hi: number, step: number, thetaDeg: number) {
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  const n = Math.round((hi - lo) / step);
  for (let i = 0; i <= n; i++) {
    const l = lo + i * step;
    wavelengthNm.push(l);
    transmission.push(unpolarisedT(stack, l, thetaDeg));
  }
  return { wavelengthNm, transmission };
}

export function summariseDesign(d: DesignCase): DesignSummary {
  const stack = parseDesign(d.formula, d.lambda0Nm, d.indices);
  const l0 = d.lambda0Nm;
  // a coarse look for the width, then a fine curve wide enough for the reddest ray of an f/1.2 cone (g up to ≈ 1.02)
  const coarse = computeMetrics(sampled(stack, l0 - 40, l0 + 40, 0.02, 0));
  const fwhm = coarse.fwhmNm ?? 10;
  const step = Math.min(0.01, fwhm / 300);
  const normal = sampled(stack, l0 - Math.max(8 * fwhm, 15), l0 * 1.03 + 4 * fwhm, step, 0);
  const m = computeMetrics(normal);
  const cwls = FIT_ANGLES.map((a) => {
    const c = computeMetrics(sampled(stack, l0 - 25 - 3 * fwhm, l0 + 3 * fwhm, step, a));
    return { aoiDeg: a, cwlNm: c.cwlNm as number };
  });
  const fit = fitEffectiveIndex(cwls);
  return { formula: d.formula, stack, fwhmNm: m.fwhmNm ?? fwhm, cwlNm: m.cwlNm ?? l0, peakT: m.peakT, nEff: fit.nEff, normal };
}

/** Exact unpolarised cone average of the stack at each wavelength of the grid. */
export function exactConeAverage(stack: Stack, pupil: Pupil, grid: number[]): number[] {
  const q = pupil.sin2Edges;
  const K = pupil.weights.length;
  const thetas: number[] = [];
  for (let k = 0; k < K; k++) thetas.push(Math.asin(Math.sqrt(0.5 * (q[k] + q[k + 1]))) / DEG);
  return grid.map((l) => {
    let sum = 0;
    for (let k = 0; k < K; k++) if (pupil.weights[k] > 0) sum += pupil.weights[k] * unpolarisedT(stack, l, thetas[k]);
    return sum;
  });
}

export function firstOrderGap(s: DesignSummary, optic: Optic): FirstOrderGap {
  const pupil = buildPupil(optic);
  // the cone moves the passband to the blue by at most λ·(1 − s(θmax)); look a little beyond
  const sinMax = Math.sin(pupil.thetaMaxRad);
  const blue = s.cwlNm * (1 - angleScaleOfSin2(sinMax * sinMax, 1 / (s.nEff * s.nEff)));
  const lo = s.cwlNm - blue - 1.5 * s.fwhmNm;
  const hi = s.cwlNm + 1.5 * s.fwhmNm;
  const step = s.fwhmNm / 40;
  const grid: number[] = [];
  for (let l = lo; l <= hi; l += step) grid.push(l);
  const exact = exactConeAverage(s.stack, pupil, grid);
  const first = coneCurve(s.normal, pupil, { nEff: s.nEff }, grid).transmission;
  const peak = Math.max(...exact);
  let over = -Infinity;
  let under = -Infinity;
  let best = 0;
  for (let i = 0; i < grid.length; i++) {
    if (first[i] > first[best]) best = i;
    if (exact[i] < peak / 2) continue;
    over = Math.max(over, first[i] - exact[i]);
    under = Math.max(under, exact[i] - first[i]);
  }
  return { over: 100 * Math.max(0, over), under: 100 * Math.max(0, under), atBest: 100 * (first[best] - exact[best]) };
}
