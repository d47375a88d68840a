/**
 * Odds for a buyer: units of one filter model differ, so what share of them keep
 * at least X of the line on this optic?
 *
 * Counted: the measured units (normal incidence), each run through the cone
 * model exactly: "meeting" of "units".
 *
 * Fitted: CWL c and FWHM w taken as independent normal variables, with the
 * sample mean and standard deviation (n − 1) of the measured units. A unit of
 * centre c and width w is the label's template unit (the one nearest the means)
 * stretched about its centre c_t by w / w_t and moved to c:
 *   T_{c,w}(λ) = T_t(c_t + (λ − c) · w_t / w),
 * so the shape is the measured one and only c and w vary. For each width on a
 * Simpson grid over w̄ ± 4.5 σ_w, τ is computed for a whole grid of centres in
 * one sweep of the cone model (moving the centre is the model's pre-shift), and
 *   P = ∫∫ φ(c; c̄, σ_c) φ(w; w̄, σ_w) · [τ(c, w) ≥ X] dc dw,
 * the c integral taken exactly from the normal CDF between the points where τ
 * crosses X (located linearly between grid centres).
 */

import { coneKernel, coneSweep } from './cone';
import { prepareCleanCurve, prepareCurve, type PreparedCurve } from './curve';
import { EngineInputError } from './errors';
import { halfMaximumEdges } from './metrics';
import type { Pupil } from './pupil';
import { unitSpread, type SpreadStats } from './spread';
import type { CurvePoints } from './types';

/**
 * erf(x) by Abramowitz & Stegun 7.1.26 (Handbook of Mathematical Functions,
 * 1964), absolute error below 1.5·10⁻⁷.
 */
export function erf(x: number): number {
  const s = x < 0 ? -1 : 1;
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}

/** Standard normal CDF Φ(z) = ½(1 + erf(z/√2)). */
export function normalCdf(z: number): number {
  if (z === Infinity) return 1;
  if (z === -Infinity) return 0;
  return 0.5 * (1 + erf(z / Math.SQRT2));
}

export interface OddsUnit {
  points: CurvePoints;
  /** Effective index of this unit, when fitted; the request's or the default otherwise. */
  nEff: number;
}

export interface OddsInput {
  units: OddsUnit[];
  pupil: Pupil;
  lineNm: number;
  minThroughput: number;
  /** Extra shift of every unit, nm toward the red (a pre-shift the buyer would order). */
  preShiftNm?: number;
  /** n_eff for the fitted spread's template; the template unit's own when absent. */
  nEff?: number;
}

export interface OddsResult {
  units: number;
  meeting: number;
  /** Line throughput of each measured unit, in the order given. */
  throughputs: number[];
  /** Fitted probability that a unit keeps at least minThroughput; null below MIN_UNITS or without FWHMs. */
  probability: number | null;
  cwlSpreadNm: SpreadStats;
  fwhmSpreadNm: SpreadStats;
  distribution: string;
  /** Index of the unit used as the shape template. */
  templateIndex: number | null;
  reason?: string;
}

export const MIN_UNITS = 3;
const WIDTH_NODES = 13;
const CENTRE_STEPS = 240;
const SPAN_SIGMA = 4.5;

function centreAndWidth(c: PreparedCurve): { cwl: number; fwhm: number } | null {
  const { leftNm, rightNm } = halfMaximumEdges(c);
  if (leftNm === null || rightNm === null || !(rightNm > leftNm)) return null;
  return { cwl: 0.5 * (leftNm + rightNm), fwhm: rightNm - leftNm };
}

/** τ(c) on a grid of centres for the template stretched to width w (one cone sweep). */
function tauOverCentres(t: PreparedCurve, ct: number, wt: number, w: number, centres: Float64Array, pupil: Pupil, lineNm: number, nEff: number, preShiftNm: number): Float64Array {
  const k = w / wt;
  const n = t.n;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = ct + (t.x[i] - ct) * k;
  const stretched = prepareCleanCurve(x, t.y);
  const kernel = coneKernel(pupil, nEff);
  // the unit at centre c is the stretched template moved by Δ = c − c_t (+ pre-shift);
  // the sweep wants x = λ·g − Δ rising, i.e. Δ falling
  const m = centres.length;
  const A = new Float64Array(m).fill(lineNm);
  const B = new Float64Array(m);
  for (let i = 0; i < m; i++) B[i] = -(centres[m - 1 - i] - ct + preShiftNm);
  const out = new Float64Array(m);
  coneSweep(stretched, kernel, A, B, out);
  const tau = new Float64Array(m);
  for (let i = 0; i < m; i++) tau[i] = out[m - 1 - i];
  return tau;
}

/** ∫ φ over the set where τ ≥ X, τ linear between grid centres, with the tails beyond the grid taken from the end values. */
function probabilityAlong(centres: Float64Array, tau: Float64Array, X: number, mean: number, sd: number): number {
  const F = (c: number) => (sd > 0 ? normalCdf((c - mean) / sd) : c >= mean ? 1 : 0);
  const m = centres.length;
  let p = 0;
  if (tau[0] >= X) p += F(centres[0]);
  if (tau[m - 1] >= X) p += 1 - F(centres[m - 1]);
  for (let i = 0; i + 1 < m; i++) {
    const a = tau[i] >= X;
    const b = tau[i + 1] >= X;
    if (a && b) p += F(centres[i + 1]) - F(centres[i]);
    else if (a !== b) {
      const f = (X - tau[i]) / (tau[i + 1] - tau[i]);
      const cross = centres[i] + f * (centres[i + 1] - centres[i]);
      p += a ? F(cross) - F(centres[i]) : F(centres[i + 1]) - F(cross);
    }
  }
  return p;
}

export function unitOdds(input: OddsInput): OddsResult {
  const { units, pupil, lineNm, minThroughput } = input;
  if (!(minThroughput >= 0 && minThroughput <= 1)) {
    throw new EngineInputError('minThroughput must be a fraction from 0 to 1.', [{ field: 'minThroughput', message: 'must be between 0 and 1' }]);
  }
  const pre = input.preShiftNm ?? 0;
  const prepared = units.map((u) => prepareCurve(u.points));
  const shapes = prepared.map(centreAndWidth);
  const spread = unitSpread(shapes.map((s) => ({ cwlNm: s?.cwl ?? null, fwhmNm: s?.fwhm ?? null })));
  const throughputs = prepared.map((c, i) => {
    const kernel = coneKernel(pupil, input.nEff ?? units[i].nEff);
    const out = new Float64Array(1);
    coneSweep(c, kernel, [lineNm], [-pre], out);
    return out[0];
  });
  const meeting = throughputs.filter((t) => t >= minThroughput).length;
  const distribution =
    'CWL and FWHM as independent normal distributions, fitted by the sample mean and standard deviation of the measured units; each drawn unit has the shape and effective index of the unit nearest the means';
  const base = { units: units.length, meeting, throughputs, cwlSpreadNm: spread.cwl, fwhmSpreadNm: spread.fwhm, distribution };
  if (units.length < MIN_UNITS) {
    return {
      ...base,
      probability: null,
      templateIndex: null,
      reason: `Only ${units.length} measured unit${units.length === 1 ? '' : 's'} of this label; a spread needs at least ${MIN_UNITS}.`,
    };
  }
  const cM = spread.cwl.mean;
  const cS = spread.cwl.sd;
  const wM = spread.fwhm.mean;
  const wS = spread.fwhm.sd;
  const withShape = shapes.filter(Boolean).length;
  if (cM === null || cS === null || wM === null || wS === null || withShape < MIN_UNITS) {
    return { ...base, probability: null, templateIndex: null, reason: `Fewer than ${MIN_UNITS} units have a measurable CWL and FWHM, so no spread can be fitted.` };
  }
  // template: the unit nearest the means in units of the spread
  let ti = -1;
  let best = Infinity;
  shapes.forEach((s, i) => {
    if (!s) return;
    const d = ((s.cwl - cM) / (cS || 1)) ** 2 + ((s.fwhm - wM) / (wS || 1)) ** 2;
    if (d < best) {
      best = d;
      ti = i;
    }
  });
  const t = prepared[ti];
  const { cwl: ct, fwhm: wt } = shapes[ti]!;
  const nEff = input.nEff ?? units[ti].nEff;

  const centreSpan = Math.max(SPAN_SIGMA * cS, 1e-6);
  const centres = new Float64Array(CENTRE_STEPS + 1);
  for (let i = 0; i <= CENTRE_STEPS; i++) centres[i] = cM - centreSpan + (2 * centreSpan * i) / CENTRE_STEPS;

  let probability: number;
  if (!(wS > 0)) {
    probability = probabilityAlong(centres, tauOverCentres(t, ct, wt, wM, centres, pupil, lineNm, nEff, pre), minThroughput, cM, cS);
  } else {
    // Simpson over w̄ ± 4.5σ_w with the normal density, renormalised to the span's mass
    const n = WIDTH_NODES - 1;
    const h = (2 * SPAN_SIGMA * wS) / n;
    let num = 0;
    let den = 0;
    for (let j = 0; j <= n; j++) {
      const w = wM - SPAN_SIGMA * wS + j * h;
      if (!(w > 0)) continue;
      const sw = (j === 0 || j === n ? 1 : j % 2 === 1 ? 4 : 2) * Math.exp(-0.5 * ((w - wM) / wS) ** 2);
      den += sw;
      num += sw * probabilityAlong(centres, tauOverCentres(t, ct, wt, w, centres, pupil, lineNm, nEff, pre), minThroughput, cM, cS);
    }
    probability = den > 0 ? num / den : 0;
  }
  return { ...base, probability: Math.min(1, Math.max(0, probability)), templateIndex: ti };
}

/** "7 of 9 measured units; about 80 % of units, from 9 measurements". */
export function oddsSentence(r: Pick<OddsResult, 'units' | 'meeting' | 'probability' | 'reason'>): string {
  const counted = `${r.meeting} of ${r.units} measured unit${r.units === 1 ? '' : 's'}`;
  if (r.probability === null) return `${counted}; ${r.reason ?? 'no fitted spread'}`;
  const pct = r.probability >= 0.995 ? 'nearly all' : r.probability < 0.005 ? 'almost none' : `about ${Math.round(r.probability * 100)} %`;
  return `${counted}; ${pct} of units, from ${r.units} measurements`;
}
