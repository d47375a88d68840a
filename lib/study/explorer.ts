/**
 * The bandwidth / pre-shift explorer: line throughput of an ideal flat-top
 * passband (T = 1 inside, 0 outside, at normal incidence) against its FWHM and
 * its pre-shift, for one optic and one line. A ray at θ passes the line when
 * λ/s(θ) falls inside [c − w/2, c + w/2] with c = λ + Δ (docs/model.md §Angle shift), which is
 * an interval of sin²θ; τ is the pupil's weight inside that interval, read from
 * the pupil's cumulative weight in sin²θ. No curve is sampled, so the map is
 * exact up to the pupil's binning.
 */

import { angleScaleOfSin2 } from '@/lib/engine/angles';
import type { Pupil } from '@/lib/engine/pupil';

export interface ExplorerMarker {
  key: string;
  label: string;
  widthNm: number;
  shiftNm: number;
  throughput: number;
}

export interface ExplorerGrid {
  lineNm: number;
  nEff: number;
  /** Passband FWHM values, nm (columns). */
  widthsNm: number[];
  /** Pre-shift values, nm toward the red (rows). */
  shiftsNm: number[];
  /** tau[row][col]: row = pre-shift index, col = width index. */
  tau: number[][];
  /** For each width, the pre-shift that passes the most line light. */
  ridge: { widthNm: number; shiftNm: number; throughput: number }[];
  markers: ExplorerMarker[];
}

/** Pupil weight with sin²θ ≤ q, linear between the pupil's bin edges. */
export function pupilWeightBelowSin2(pupil: Pupil, q: number): number {
  const e = pupil.sin2Edges;
  const K = e.length - 1;
  if (q <= e[0]) return 0;
  if (q >= e[K]) return 1;
  let lo = 0;
  let hi = K;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (e[mid] <= q) lo = mid;
    else hi = mid;
  }
  const span = e[hi] - e[lo];
  const t = span > 0 ? (q - e[lo]) / span : 1;
  return pupil.cdf[lo] + t * (pupil.cdf[hi] - pupil.cdf[lo]);
}

/** τ of an ideal flat-top passband of FWHM w centred at λ + Δ (normal incidence) for the line at λ. */
export function flatTopThroughput(pupil: Pupil, nEff: number, lineNm: number, widthNm: number, shiftNm: number): number {
  const lo = lineNm + shiftNm - widthNm / 2;
  const hi = lineNm + shiftNm + widthNm / 2;
  if (!(widthNm > 0) || hi <= 0) return 0;
  // λ/s ≤ hi ⇔ s ≥ λ/hi; λ/s ≥ lo ⇔ s ≤ λ/lo (s ≤ 1, falling with θ).
  const sMin = lineNm / hi;
  if (sMin > 1) return 0;
  const n2 = nEff * nEff;
  const qMax = n2 * (1 - sMin * sMin);
  const sMax = lo > 0 ? lineNm / lo : Infinity;
  const qMin = sMax >= 1 ? -Infinity : n2 * (1 - sMax * sMax);
  const upper = pupilWeightBelowSin2(pupil, qMax);
  const lower = qMin === -Infinity ? 0 : pupilWeightBelowSin2(pupil, qMin);
  return Math.max(0, upper - lower);
}

function steps(from: number, to: number, step: number): number[] {
  const n = Math.max(1, Math.round((to - from) / step));
  return Array.from({ length: n + 1 }, (_, i) => Math.round((from + ((to - from) * i) / n) * 1e4) / 1e4);
}

export const EXPLORER_WIDTHS = { from: 2, to: 15, step: 0.25 } as const;

/** Widths the explorer's summary reads out (each on the grid above). */
export const EXPLORER_HIGHLIGHT_WIDTHS_NM: readonly number[] = [2.5, 4.5, 7, 9];

/**
 * The map for one optic (its on-axis pupil), one line and one n_eff, sized so the
 * shift the optic's marginal ray causes, and every placed curve, are inside it.
 */
export function explorerGrid(pupil: Pupil, nEff: number, lineNm: number, markers: ExplorerMarker[] = []): ExplorerGrid {
  const sinMax2 = Math.sin(pupil.thetaMaxRad) ** 2;
  const marginalShift = lineNm * (1 / angleScaleOfSin2(sinMax2, 1 / (nEff * nEff)) - 1);
  const placed = markers.filter((m) => Number.isFinite(m.widthNm) && Number.isFinite(m.shiftNm));
  const wMax = Math.max(EXPLORER_WIDTHS.to, ...placed.map((m) => Math.ceil(m.widthNm + 1)));
  const widthsNm = steps(EXPLORER_WIDTHS.from, Math.min(wMax, 40), EXPLORER_WIDTHS.step);
  let sLo = -2;
  let sHi = Math.max(6, Math.ceil(marginalShift + 2));
  for (const m of placed) {
    sLo = Math.min(sLo, Math.floor(m.shiftNm - 1));
    sHi = Math.max(sHi, Math.ceil(m.shiftNm + 1));
  }
  sLo = Math.max(sLo, -40);
  sHi = Math.min(sHi, 60);
  const rows = 90;
  const shiftsNm = steps(sLo, sHi, (sHi - sLo) / rows);
  const tau = shiftsNm.map((d) => widthsNm.map((w) => flatTopThroughput(pupil, nEff, lineNm, w, d)));
  // A band wider than the cone passes everything over a range of shifts: take the middle of that plateau.
  const ridge = widthsNm.map((w, col) => {
    let max = 0;
    for (let r = 0; r < shiftsNm.length; r++) max = Math.max(max, tau[r][col]);
    const top = shiftsNm.map((_, r) => r).filter((r) => tau[r][col] >= max - 1e-6);
    let runStart = top[0];
    let best = { from: top[0], to: top[0] };
    for (let i = 1; i < top.length; i++) {
      if (top[i] !== top[i - 1] + 1) runStart = top[i];
      if (top[i] - runStart > best.to - best.from) best = { from: runStart, to: top[i] };
    }
    const mid = Math.round((best.from + best.to) / 2);
    return { widthNm: w, shiftNm: shiftsNm[mid], throughput: tau[mid][col] };
  });
  return { lineNm, nEff, widthsNm, shiftsNm, tau, ridge, markers: placed };
}
