/**
 * Transmission of a thin-film stack by the characteristic (transfer) matrix,
 * for s and p light (H. A. Macleod, Thin-Film Optical Filters, ch. 2; M. Born &
 * E. Wolf, Principles of Optics, §1.6). Layers are lossless (real indices).
 *
 * With the incident medium n0 at angle θ0, Snell's law n0 sin θ0 = n_r sin θ_r
 * gives each layer's angle, and each medium its tilted admittance (in units of
 * the free-space admittance)
 *   η_r = n_r cos θ_r   (s),      η_r = n_r / cos θ_r   (p).
 * A layer of physical thickness d_r has phase thickness δ_r = 2π n_r d_r cos θ_r / λ
 * and characteristic matrix
 *   M_r = [[cos δ_r, i sin δ_r / η_r], [i η_r sin δ_r, cos δ_r]].
 * The assembly, taken from the incident side,
 *   [B, C]ᵀ = M_1 M_2 … M_q [1, η_sub]ᵀ
 * gives the input admittance Y = C/B and
 *   r = (η0 − Y)/(η0 + Y),  R = |r|²,  T = 4 η0 η_sub / |η0 B + C|².
 * For lossless layers R + T = 1. Transmission is into the substrate (its back
 * face is left out, as for the design's own curve).
 *
 * Designs are written in the usual shorthand: H and L are layers a quarter wave
 * thick (optical thickness λ0/4 at normal incidence) of the high and low index;
 * "2H" is a half wave; "(HL)^4" repeats the group four times.
 */

import { DEG } from './angles';
import { EngineInputError } from './errors';

export type Polarisation = 's' | 'p';

export interface Layer {
  /** Refractive index (real: lossless). */
  n: number;
  /** Physical thickness, nm. */
  thicknessNm: number;
}

export interface Stack {
  incidentIndex: number;
  substrateIndex: number;
  /** From the incident side to the substrate. */
  layers: Layer[];
}

export interface StackResponse {
  R: number;
  T: number;
}

/**
 * R and T of the stack at one wavelength, incidence angle (in the incident
 * medium) and polarisation.
 */
export function stackResponse(stack: Stack, lambdaNm: number, thetaDeg: number, pol: Polarisation): StackResponse {
  const n0 = stack.incidentIndex;
  const sin0 = Math.sin(thetaDeg * DEG);
  const beta = n0 * sin0; // conserved n sin θ
  const adm = (n: number) => {
    const cos = Math.sqrt(Math.max(0, 1 - (beta / n) ** 2));
    return { cos, eta: pol === 's' ? n * cos : n / cos };
  };
  const eta0 = adm(n0).eta;
  const etaS = adm(stack.substrateIndex).eta;
  // [B, C] starts as [1, η_sub] and is multiplied by M_q … M_1 from the substrate side outward.
  // B and C are complex: (bRe + i bIm), (cRe + i cIm).
  let bRe = 1;
  let bIm = 0;
  let cRe = etaS;
  let cIm = 0;
  const k = (2 * Math.PI) / lambdaNm;
  for (let j = stack.layers.length - 1; j >= 0; j--) {
    const { n, thicknessNm } = stack.layers[j];
    const { cos, eta } = adm(n);
    const delta = k * n * thicknessNm * cos;
    const cd = Math.cos(delta);
    const sd = Math.sin(delta);
    // B' = cos δ·B + i (sin δ/η)·C ;  C' = i η sin δ·B + cos δ·C
    const nbRe = cd * bRe - (sd / eta) * cIm;
    const nbIm = cd * bIm + (sd / eta) * cRe;
    const ncRe = cd * cRe - eta * sd * bIm;
    const ncIm = cd * cIm + eta * sd * bRe;
    bRe = nbRe;
    bIm = nbIm;
    cRe = ncRe;
    cIm = ncIm;
  }
  const dRe = eta0 * bRe + cRe;
  const dIm = eta0 * bIm + cIm;
  const den = dRe * dRe + dIm * dIm;
  const T = (4 * eta0 * etaS) / den;
  // r = (η0 B − C)/(η0 B + C)
  const nRe = eta0 * bRe - cRe;
  const nIm = eta0 * bIm - cIm;
  const R = (nRe * nRe + nIm * nIm) / den;
  return { R, T };
}

/** Unpolarised transmission: the mean of s and p. */
export function unpolarisedT(stack: Stack, lambdaNm: number, thetaDeg: number): number {
  return 0.5 * (stackResponse(stack, lambdaNm, thetaDeg, 's').T + stackResponse(stack, lambdaNm, thetaDeg, 'p').T);
}

export interface DesignIndices {
  H: number;
  L: number;
  incident?: number;
  substrate?: number;
}

const MAX_LAYERS = 2000;
const MAX_DEPTH = 20;

/**
 * Layers of a design formula such as "(HL)^4 2H (LH)^4 L (HL)^4 2H (LH)^4":
 * H and L quarter waves at λ0, an integer before a letter multiplies its
 * thickness, "(…)^n" repeats a group. Read by a small recursive descent, one
 * character at a time.
 */
export function parseDesign(formula: string, lambda0Nm: number, ix: DesignIndices): Stack {
  let at = 0;
  const fail = (msg: string): never => {
    throw new EngineInputError(`Design formula, character ${at + 1}: ${msg}.`, [{ field: 'design', message: msg }]);
  };
  const skip = () => {
    while (at < formula.length && formula[at] === ' ') at++;
  };
  const integer = (): number | null => {
    const start = at;
    while (at < formula.length && formula[at] >= '0' && formula[at] <= '9') at++;
    if (at === start) return null;
    const v = Number(formula.slice(start, at));
    if (!(v >= 1 && v <= 200)) fail('a count must be between 1 and 200');
    return v;
  };
  // quarter-wave counts per layer, with its index
  const sequence = (): { n: number; q: number }[] => {
    const out: { n: number; q: number }[] = [];
    for (;;) {
      skip();
      if (at >= formula.length || formula[at] === ')') return out;
      const mult = integer() ?? 1;
      skip();
      const ch = formula[at];
      if (ch === 'H' || ch === 'L') {
        at++;
        out.push({ n: ch === 'H' ? ix.H : ix.L, q: mult });
      } else if (ch === '(') {
        at++;
        if (++depth > MAX_DEPTH) fail(`groups nest deeper than ${MAX_DEPTH}`);
        const inner = sequence();
        depth--;
        if (formula[at] !== ')') fail('a "(" is not closed');
        at++;
        let times = 1;
        if (formula[at] === '^') {
          at++;
          times = integer() ?? fail('"^" needs a count');
        }
        for (let t = 0; t < times * mult; t++) {
          out.push(...inner);
          if (out.length > MAX_LAYERS) fail(`more than ${MAX_LAYERS} layers`);
        }
      } else {
        fail(`unexpected "${ch}"`);
      }
      if (out.length > MAX_LAYERS) fail(`more than ${MAX_LAYERS} layers`);
    }
  };
  let depth = 0;
  const seq = sequence();
  if (at < formula.length) fail('unmatched ")"');
  // merge neighbours of the same material ("H 2H" is one 3H layer)
  const layers: Layer[] = [];
  for (const { n, q } of seq) {
    const d = (q * lambda0Nm) / (4 * n);
    const last = layers[layers.length - 1];
    if (last && last.n === n) last.thicknessNm += d;
    else layers.push({ n, thicknessNm: d });
  }
  return { incidentIndex: ix.incident ?? 1, substrateIndex: ix.substrate ?? 1.52, layers };
}

/**
 * Peak reflectance of a quarter-wave stack (HL)^p H between n0 and n_s at λ0
 * (Macleod, ch. 2, "the quarter-wave stack"):
 *   Y = (n_H/n_L)^(2p) · n_H² / n_s,   R = ((n0 − Y)/(n0 + Y))².
 */
export function quarterWaveStackPeakR(nH: number, nL: number, pairs: number, n0: number, ns: number): number {
  const Y = (nH / nL) ** (2 * pairs) * ((nH * nH) / ns);
  return ((n0 - Y) / (n0 + Y)) ** 2;
}
