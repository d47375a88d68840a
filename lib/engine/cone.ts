/**
 * The cone model (docs/model.md §Angle shift to §Throughput). A ray at incidence θ sees the passband scaled
 * by s(θ) = sqrt(1 − sin²θ / n_eff²), so with g = 1/s and the measured curve
 * T_m taken at AOI θm,
 *   T_θ(λ) = T_m(s_m · (λ·g − Δ)),
 * which is linear in g. The pupil gives bins in sin²θ with exact weights; inside
 * a bin the light's density is taken as a straight line in g, and the integral
 * of a piecewise-linear curve against it is exact from two running integrals
 * (∫T and ∫λT). So each τ costs one lookup per bin edge, with no error from the
 * kinks and steep edges of a measured curve that defeat point quadrature.
 */

import { interpolate, locate, prepareCurve, segmentMoment, type PreparedCurve } from './curve';
import { angleScale, angleScaleOfSin2 } from './angles';
import { EngineInputError, type InputDetail } from './errors';
import { inRange, MODEL_REACH, REQUEST_LIMITS } from './limits';
import { halfMaximumEdges } from './metrics';
import type { Pupil } from './pupil';
import type { CurvePoints, ShiftParams } from './types';

/** Reference temperature when a temperature is given without one, °C (room temperature). */
export const DEFAULT_REF_TEMP_C = 20;
/** Granularity of the best pre-shift, nm (docs/model.md §Throughput). */
export const PRESHIFT_STEP_NM = 0.01;
/** Above this many 0.01 nm candidates the search goes coarse-then-refine. */
const MAX_EXHAUSTIVE_STEPS = 6000;

export function validateShift(p: ShiftParams): InputDetail[] {
  const d: InputDetail[] = [];
  const num = (v: unknown) => typeof v === 'number' && Number.isFinite(v);
  const { nEff, tempCoeffNmPerC } = REQUEST_LIMITS;
  const { measuredAoiDeg, preShiftNm } = MODEL_REACH;
  if (!inRange(p.nEff, nEff)) d.push({ field: 'nEff', message: `the effective index must be between ${nEff[0].toFixed(1)} and ${nEff[1].toFixed(1)}` });
  if (p.measuredAoiDeg !== undefined && !inRange(p.measuredAoiDeg, measuredAoiDeg)) {
    d.push({ field: 'measuredAoiDeg', message: `the measurement AOI must be between ${measuredAoiDeg[0]} and ${measuredAoiDeg[1]} degrees` });
  }
  if (p.nEffPolarised !== undefined) {
    for (const pol of ['s', 'p'] as const) {
      const v = p.nEffPolarised?.[pol];
      if (!num(v) || !inRange(v!, nEff)) d.push({ field: `nEffPolarised.${pol}`, message: `the ${pol} effective index must be between ${nEff[0].toFixed(1)} and ${nEff[1].toFixed(1)}` });
    }
  }
  for (const f of ['preShiftNm', 'tempCoeffNmPerC', 'tempC', 'refTempC'] as const) {
    if (p[f] !== undefined && !num(p[f])) d.push({ field: f, message: `${f} must be a finite number` });
  }
  if (num(p.preShiftNm) && !inRange(p.preShiftNm, preShiftNm)) d.push({ field: 'preShiftNm', message: `the pre-shift must be within ±${preShiftNm[1]} nm` });
  if (num(p.tempCoeffNmPerC) && !inRange(p.tempCoeffNmPerC, tempCoeffNmPerC)) d.push({ field: 'tempCoeffNmPerC', message: `the temperature coefficient must be within ±${tempCoeffNmPerC[1]} nm/°C` });
  return d;
}

function assertShift(p: ShiftParams): void {
  const d = validateShift(p);
  if (d.length > 0) throw new EngineInputError(`Invalid model input: ${d[0].message}.`, d);
}

export { angleScale };

/**
 * A wavelength measured at incidence θ brought to normal incidence: λ0 = λθ / s(θ)
 * (docs/model.md §Angle shift). The catalogue's CWL column and filter, the fitness
 * grid and the study all use this one rule.
 */
export function normalIncidenceNm(measuredNm: number, thetaDeg: number, nEff: number): number {
  return thetaDeg > 0 ? measuredNm / angleScale(thetaDeg, nEff) : measuredNm;
}

/** Temperature part of Δ: k·(t − t_ref); zero unless both k and t are given. */
export function temperatureShiftNm(p: ShiftParams): number {
  if (p.tempCoeffNmPerC === undefined || p.tempC === undefined) return 0;
  return p.tempCoeffNmPerC * (p.tempC - (p.refTempC ?? DEFAULT_REF_TEMP_C));
}

/** Total Δ = pre-shift + k·(t − t_ref), nm toward the red (docs/model.md §Pre-shift). */
export function totalShiftNm(p: ShiftParams): number {
  return (p.preShiftNm ?? 0) + temperatureShiftNm(p);
}

/**
 * The pupil for one n_eff, in the variable the model integrates over: g = 1/s
 * at each bin edge, and inside each bin a linear density c0 + c1·(g − g_k)
 * that reproduces both the bin's weight and the weight of its lower half.
 * A straight density, rather than an even one, makes the result second-order
 * accurate in the bin width where the pupil's light is unevenly spread.
 */
export interface ConeKernel {
  g: Float64Array;
  weights: Float64Array;
  c0: Float64Array;
  c1: Float64Array;
}

export function coneKernel(pupil: Pupil, nEff: number): ConeKernel {
  const q = pupil.sin2Edges;
  const K = pupil.weights.length;
  const inv = 1 / (nEff * nEff);
  const gOf = (v: number) => 1 / angleScaleOfSin2(v, inv);
  const g = new Float64Array(K + 1);
  for (let k = 0; k <= K; k++) g[k] = gOf(q[k]);
  const c0 = new Float64Array(K);
  const c1 = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    const W = pupil.weights[k];
    const L = g[k + 1] - g[k];
    if (!(L > 1e-14)) continue;
    const l = gOf(0.5 * (q[k] + q[k + 1])) - g[k];
    let a = W / L;
    let b = 0;
    if (l > 0 && l < L) {
      b = (2 * (W * l - pupil.lowerHalf[k] * L)) / (L * l * (L - l));
      a = (W - (b * L * L) / 2) / L;
      // keep the density non-negative at both ends of the bin
      if (a < 0) {
        a = 0;
        b = (2 * W) / (L * L);
      } else if (a + b * L < 0) {
        a = (2 * W) / L;
        b = (-2 * W) / (L * L);
      }
    }
    c0[k] = a;
    c1[k] = b;
  }
  return { g, weights: pupil.weights, c0, c1 };
}

/**
 * The kernels the cone averages over. Unpolarised light is half s and half p;
 * with one n_eff both halves move alike, one kernel. A set measured in
 * polarised light gives each its own index (docs/model.md §Polarised sets):
 *   τ = ½·τ(n_eff,s) + ½·τ(n_eff,p).
 */
export function coneKernels(pupil: Pupil, p: ShiftParams): { kernel: ConeKernel; weight: number }[] {
  if (!p.nEffPolarised) return [{ kernel: coneKernel(pupil, p.nEff), weight: 1 }];
  return [
    { kernel: coneKernel(pupil, p.nEffPolarised.s), weight: 0.5 },
    { kernel: coneKernel(pupil, p.nEffPolarised.p), weight: 0.5 },
  ];
}

/** coneSweep over each kernel, weighted and summed; a point is outside when any kernel needed the curve beyond its range. */
function sweepKernels(
  c: PreparedCurve,
  kernels: { kernel: ConeKernel; weight: number }[],
  A: ArrayLike<number>,
  B: ArrayLike<number>,
  out: Float64Array,
  outside?: Uint8Array,
): void {
  if (kernels.length === 1 && kernels[0].weight === 1) {
    coneSweep(c, kernels[0].kernel, A, B, out, outside);
    return;
  }
  const part = new Float64Array(out.length);
  const partOut = outside ? new Uint8Array(out.length) : undefined;
  out.fill(0);
  for (const { kernel, weight } of kernels) {
    coneSweep(c, kernel, A, B, part, partOut);
    for (let i = 0; i < out.length; i++) {
      out[i] += weight * part[i];
      if (outside && partOut![i]) outside[i] = 1;
    }
  }
}

/** g = 1/s at each pupil bin edge for this n_eff. */
export function scaleEdges(pupil: Pupil, nEff: number): Float64Array {
  return coneKernel(pupil, nEff).g;
}

/**
 * τ for a run of (A_i, B_i) with x = A_i·g + B_i, the argument of the measured
 * curve. When x rises with i at every edge (growing λ, or a falling Δ) each
 * edge keeps its own pointer into the samples and the whole run is one sweep.
 * `outside[i]` is set when the run needed the curve beyond its measured range.
 */
export function coneSweep(
  c: PreparedCurve,
  kernel: ConeKernel,
  A: ArrayLike<number>,
  B: ArrayLike<number>,
  out: Float64Array,
  outside?: Uint8Array,
): void {
  const { x: xs, y, slope, cum, mom, n, xMin, xMax, total } = c;
  const { g, weights, c0, c1 } = kernel;
  const x0 = xs[0];
  const momTotal = mom[n - 1];
  const K = weights.length;
  const ptr = new Int32Array(K + 1);
  const first = A.length > 0 ? A[0] * g[0] + B[0] : 0;
  ptr.fill(locate(xs, first));
  const tiny = 1e-9;
  for (let i = 0; i < A.length; i++) {
    const a = A[i];
    const b = B[i];
    const invA = 1 / a;
    let sum = 0;
    let prevX = 0;
    let prevC = 0;
    let prevM = 0;
    for (let k = 0; k <= K; k++) {
      const xv = a * g[k] + b;
      let cv: number;
      let mv: number;
      if (xv <= xMin) {
        cv = 0;
        mv = 0;
      } else if (xv >= xMax) {
        cv = total;
        mv = momTotal;
      } else {
        let j = ptr[k];
        if (xv < xs[j]) j = locate(xs, xv);
        while (j < n - 2 && xs[j + 1] <= xv) j++;
        ptr[k] = j;
        const d = xv - xs[j];
        const yj = y[j];
        const mj = slope[j];
        cv = cum[j] + d * (yj + 0.5 * mj * d);
        mv = mom[j] + segmentMoment(xs[j] - x0, yj, mj, d);
      }
      if (k > 0) {
        const dx = xv - prevX;
        if (dx > tiny) {
          const dC = cv - prevC;
          // ∫ T·(c0 + c1·(g − g_k)) dg with g − g_k = (x − x_k)/A
          sum += invA * (c0[k - 1] * dC + c1[k - 1] * invA * (mv - prevM - (prevX - x0) * dC));
        } else {
          sum += weights[k - 1] * interpolate(c, 0.5 * (xv + prevX));
        }
      }
      prevX = xv;
      prevC = cv;
      prevM = mv;
    }
    out[i] = sum < 0 ? 0 : sum;
    if (outside) outside[i] = a * g[0] + b < xMin || a * g[K] + b > xMax ? 1 : 0;
  }
}

export interface LineThroughput {
  /** Cone-averaged transmission at the line, τ. */
  throughput: number;
  /** Transmission at normal incidence in a collimated beam, T′(λ). */
  collimated: number;
  /** False when the result needed the curve outside its measured range. */
  covered: boolean;
}

/** The measurement frame: s_m, the scale at the measurement AOI (1 at normal incidence), and the total shift Δ. */
export function shiftFrame(p: ShiftParams): { sM: number; shift: number } {
  const sM = p.measuredAoiDeg ? angleScale(p.measuredAoiDeg, p.nEff) : 1;
  return { sM, shift: totalShiftNm(p) };
}

export function lineThroughput(
  points: CurvePoints | PreparedCurve,
  pupil: Pupil,
  lambdaNm: number,
  params: ShiftParams,
): LineThroughput {
  assertShift(params);
  if (!Number.isFinite(lambdaNm) || lambdaNm <= 0) {
    throw new EngineInputError('The line wavelength must be a positive number.', [{ field: 'lineNm', message: 'must be > 0' }]);
  }
  const c = prepareCurve(points);
  const { sM, shift } = shiftFrame(params);
  const kernels = coneKernels(pupil, params);
  const out = new Float64Array(1);
  const outside = new Uint8Array(1);
  const A = sM * lambdaNm;
  const B = -sM * shift;
  sweepKernels(c, kernels, [A], [B], out, outside);
  const xc = A + B;
  return {
    throughput: out[0],
    collimated: interpolate(c, xc),
    covered: outside[0] === 0 && xc >= c.xMin && xc <= c.xMax,
  };
}

export interface ConeCurve extends CurvePoints {
  /** False when some grid point needed the curve beyond its measured range. */
  covered: boolean;
}

/**
 * The cone-averaged curve. Without a grid it is evaluated at the measured
 * samples carried to normal incidence and shifted by Δ, keeping only those whose
 * whole cone falls inside the measured range, so the default curve never rests
 * on the zero assumed outside it.
 */
export function coneCurve(
  points: CurvePoints | PreparedCurve,
  pupil: Pupil,
  params: ShiftParams,
  wavelengthGrid?: ArrayLike<number>,
): ConeCurve {
  assertShift(params);
  const c = prepareCurve(points);
  const { sM, shift } = shiftFrame(params);
  const kernels = coneKernels(pupil, params);
  // the default grid keeps samples whose whole cone is measured: the lowest index reaches furthest
  const g = kernels.reduce((w, k) => (k.kernel.g[k.kernel.g.length - 1] > w.g[w.g.length - 1] ? k.kernel : w), kernels[0].kernel).g;
  const K = pupil.weights.length;
  let grid: Float64Array;
  if (wavelengthGrid) {
    grid = Float64Array.from(wavelengthGrid);
    for (let i = 0; i < grid.length; i++) {
      if (!Number.isFinite(grid[i]) || grid[i] <= 0) {
        throw new EngineInputError('The wavelength grid must hold positive numbers.', [{ field: 'wavelengthGrid', index: i, message: 'not a positive number' }]);
      }
    }
  } else {
    const lo = (c.xMin / sM + shift) / g[0];
    const hi = (c.xMax / sM + shift) / g[K];
    const kept: number[] = [];
    for (let j = 0; j < c.n; j++) {
      const lam = c.x[j] / sM + shift;
      if (lam >= lo * (1 - 1e-12) && lam <= hi * (1 + 1e-12)) kept.push(lam);
    }
    grid = Float64Array.from(kept.length >= 2 ? kept : Array.from(c.x, (v) => v / sM + shift));
  }
  const m = grid.length;
  const order = new Uint32Array(m);
  for (let i = 0; i < m; i++) order[i] = i;
  let sorted = true;
  for (let i = 1; i < m; i++) if (grid[i] < grid[i - 1]) sorted = false;
  if (!sorted) order.sort((a, b) => grid[a] - grid[b]);
  const A = new Float64Array(m);
  const B = new Float64Array(m).fill(-sM * shift);
  for (let i = 0; i < m; i++) A[i] = sM * grid[order[i]];
  const tau = new Float64Array(m);
  const outside = new Uint8Array(m);
  sweepKernels(c, kernels, A, B, tau, outside);
  const transmission = new Array<number>(m);
  let covered = true;
  for (let i = 0; i < m; i++) {
    transmission[order[i]] = tau[i];
    if (outside[i]) covered = false;
  }
  return { wavelengthNm: Array.from(grid), transmission, covered };
}

export interface PreShiftResult {
  /** The best pre-shift, nm toward the red, on a 0.01 nm grid. */
  nm: number;
  throughput: number;
  /** Range searched, nm. */
  range: [number, number];
}

/** FWHM of the curve once carried to normal incidence (it stretches by 1/s_m). */
export function normalIncidenceFwhm(c: PreparedCurve, params: ShiftParams): number | null {
  const { leftNm, rightNm } = halfMaximumEdges(c);
  if (leftNm === null || rightNm === null || !(c.peak > 0)) return null;
  return (rightNm - leftNm) / shiftFrame(params).sM;
}

/**
 * The pre-shift Δ in [−FWHM, +2·FWHM] that maximises τ at the line (docs/model.md §Throughput).
 * `params.preShiftNm` is replaced by each candidate; any temperature shift stays
 * on top. Every 0.01 nm candidate is evaluated (one sweep), so several maxima
 * cannot mislead it; very wide ranges fall back to a 4000-point scan refined by
 * golden-section search around the best few local maxima.
 */
export function bestPreShift(
  points: CurvePoints | PreparedCurve,
  pupil: Pupil,
  lambdaNm: number,
  params: ShiftParams,
  range?: [number, number],
): PreShiftResult | null {
  assertShift(params);
  const c = prepareCurve(points);
  let lo: number;
  let hi: number;
  if (range) [lo, hi] = range;
  else {
    const fwhm = normalIncidenceFwhm(c, params);
    if (fwhm === null) return null;
    lo = -fwhm;
    hi = 2 * fwhm;
  }
  const { sM } = shiftFrame(params);
  const tempShift = temperatureShiftNm(params);
  const kernels = coneKernels(pupil, params);
  const A0 = sM * lambdaNm;

  // Δ descending ⇒ x rising at every edge, as the sweep needs.
  const evalMany = (deltas: Float64Array): Float64Array => {
    const m = deltas.length;
    const A = new Float64Array(m).fill(A0);
    const B = new Float64Array(m);
    for (let i = 0; i < m; i++) B[i] = -sM * (deltas[i] + tempShift);
    const out = new Float64Array(m);
    sweepKernels(c, kernels, A, B, out);
    return out;
  };
  const evalOne = (d: number) => evalMany(Float64Array.of(d))[0];

  const step = PRESHIFT_STEP_NM;
  const iLo = Math.ceil(lo / step - 1e-9);
  const iHi = Math.floor(hi / step + 1e-9);
  const onGrid = (i: number) => Math.round(i) * step;

  if (iHi - iLo + 1 <= MAX_EXHAUSTIVE_STEPS) {
    const count = iHi - iLo + 1;
    const deltas = new Float64Array(count);
    for (let k = 0; k < count; k++) deltas[k] = onGrid(iHi - k);
    const tau = evalMany(deltas);
    let best = 0;
    for (let k = 1; k < count; k++) {
      if (tau[k] > tau[best] + 1e-15 || (Math.abs(tau[k] - tau[best]) <= 1e-15 && Math.abs(deltas[k]) < Math.abs(deltas[best]))) best = k;
    }
    return { nm: deltas[best], throughput: tau[best], range: [lo, hi] };
  }

  const coarseN = 4000;
  const h = (hi - lo) / coarseN;
  const coarse = new Float64Array(coarseN + 1);
  for (let k = 0; k <= coarseN; k++) coarse[k] = hi - k * h;
  const tau = evalMany(coarse);
  const peaks: number[] = [];
  for (let k = 0; k <= coarseN; k++) {
    const left = k > 0 ? tau[k - 1] : -Infinity;
    const right = k < coarseN ? tau[k + 1] : -Infinity;
    if (tau[k] >= left && tau[k] >= right) peaks.push(k);
  }
  peaks.sort((p, q) => tau[q] - tau[p]);
  let bestNm = coarse[peaks[0] ?? 0];
  let bestTau = tau[peaks[0] ?? 0];
  const phi = (Math.sqrt(5) - 1) / 2;
  for (const k of peaks.slice(0, 5)) {
    let a = Math.max(lo, coarse[k] - h);
    let b = Math.min(hi, coarse[k] + h);
    let x1 = b - phi * (b - a);
    let x2 = a + phi * (b - a);
    let f1 = evalOne(x1);
    let f2 = evalOne(x2);
    while (b - a > step / 4) {
      if (f1 >= f2) {
        b = x2;
        x2 = x1;
        f2 = f1;
        x1 = b - phi * (b - a);
        f1 = evalOne(x1);
      } else {
        a = x1;
        x1 = x2;
        f1 = f2;
        x2 = a + phi * (b - a);
        f2 = evalOne(x2);
      }
    }
    const centre = Math.round((0.5 * (a + b)) / step);
    for (let i = centre - 2; i <= centre + 2; i++) {
      if (i < iLo || i > iHi) continue;
      const d = onGrid(i);
      const t = evalOne(d);
      if (t > bestTau) {
        bestTau = t;
        bestNm = d;
      }
    }
  }
  if (Math.abs(bestNm / step - Math.round(bestNm / step)) > 1e-6) {
    const i = Math.min(iHi, Math.max(iLo, Math.round(bestNm / step)));
    bestNm = onGrid(i);
    bestTau = evalOne(bestNm);
  }
  return { nm: bestNm, throughput: bestTau, range: [lo, hi] };
}
