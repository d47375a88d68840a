/**
 * The whole sensor, not one point: line throughput τ at every image point.
 *
 * An image point at distance r from the optical axis is reached by a chief ray
 * meeting the filter at θc(r); the optic's cone (docs/model.md §Pupil) is centred on
 * it. The model is rotationally symmetric about the axis, so
 *   τ(x, y) = τ(r),  r = sqrt(x² + y²),
 * and the map needs τ only on a radial profile. θc(r) comes from one of
 *   · the exit-pupil distance d:        θc(r) = atan(r / d)
 *   · the chief-ray angle at the corner θK at the half-diagonal rK:
 *                                       θc(r) = atan(r · tan θK / rK)
 *     (the same law, with d = rK / tan θK)
 *   · a design table of (h, θc, N?) rows, linear in h between rows, the row at
 *     h = 0 being (0, 0°, optic N) by symmetry, the last row held beyond the table.
 * τ is computed exactly (one pupil per radius, cached per optic) at about 24
 * radii spaced evenly in r² — τ is even in r, so it is smooth in r² near the
 * axis — plus the edge midpoints, the corner and every table height; each
 * interval is then halved (in r²) until its exact midpoint is predicted within
 * 1·10⁻⁴, because a steep filter edge sweeping past the line bends the profile
 * faster than 24 even nodes follow. The profile is
 * interpolated with a monotone cubic in r² (Fritsch & Carlson 1980, SIAM J.
 * Numer. Anal. 17, 238), so a 200 × 150 map costs little more than the profile.
 *
 * The share of the sensor keeping at least X uses the length of the circle of
 * radius r inside one quadrant [0, a] × [0, b],
 *   L(r) = r · (π/2 − acos(min(1, a/r)) − acos(min(1, b/r))),
 * so share(X) = (1 / ab) ∫ L(r) · [τ(r) ≥ X] dr, integrated by the midpoint rule.
 */

import { DEG } from './angles';
import { lineThroughput } from './cone';
import { prepareCurve, type PreparedCurve } from './curve';
import { EngineInputError, type InputDetail } from './errors';
import { inRange, REQUEST_LIMITS } from './limits';
import { buildPupil, MAX_FIELD_ANGLE_DEG } from './pupil';
import type { CurvePoints, Mapping, ShiftParams } from './types';


export interface ChiefRayRow {
  imageHeightMm: number;
  chiefRayDeg: number;
  /** Working f-number at this image height, when the design gives one. */
  fNumber?: number;
}

export type ChiefRaySpec = { exitPupilMm: number } | { cornerAngleDeg: number } | { table: ChiefRayRow[] };

export interface SensorSize {
  widthMm: number;
  heightMm: number;
}

export interface FieldMapInput extends ShiftParams {
  points: CurvePoints | PreparedCurve;
  optic: { fNumber: number; obstruction: number; mapping?: Mapping };
  sensor: SensorSize;
  chiefRay: ChiefRaySpec;
  lineNm: number;
  grid?: { nx: number; ny: number };
  /** Fractions 0–1. */
  thresholds?: number[];
  /** Radii spaced evenly in r² (the edges, corner and table heights are added). */
  radii?: number;
}

export interface FieldMapResult {
  centre: number;
  /** Every corner is the same distance from the axis, so this is also the worst corner. */
  corner: number;
  /** Midpoint of the left and right edges (x = ±width/2, y = 0). */
  edgeX: number;
  /** Midpoint of the top and bottom edges (x = 0, y = ±height/2). */
  edgeY: number;
  /** Lowest τ anywhere on the sensor and where (distance from the centre). */
  minimum: { throughput: number; radiusMm: number };
  areaAtLeast: { threshold: number; share: number }[];
  grid: { xMm: number[]; yMm: number[]; throughput: number[][] };
  profile: { radiusMm: number[]; chiefRayDeg: number[]; fNumber: number[]; throughput: number[] };
  /** False when some radius needed the curve beyond its measured range. */
  covered: boolean;
  warnings: string[];
}

export const DEFAULT_PROFILE_RADII = 24;
export const DEFAULT_THRESHOLDS = [0.5, 0.7, 0.8, 0.9];
export const MAX_GRID = 400;
const SHARE_STEPS = 4096;
/** The profile is refined until a midpoint is predicted within this, or it holds MAX_PROFILE_NODES radii. */
const REFINE_TOL = 1e-4;
const MAX_PROFILE_NODES = 160;

/** The chief-ray angle (degrees) and f-number at image height r, from one of the three descriptions. */
export function chiefRayLaw(spec: ChiefRaySpec, sensor: SensorSize, fNumber: number): { at: (r: number) => { deg: number; fNumber: number }; heights: number[]; lastHeight: number | null } {
  const rK = 0.5 * Math.hypot(sensor.widthMm, sensor.heightMm);
  if ('exitPupilMm' in spec) {
    const d = spec.exitPupilMm;
    return { at: (r) => ({ deg: Math.atan(r / d) / DEG, fNumber }), heights: [], lastHeight: null };
  }
  if ('cornerAngleDeg' in spec) {
    const k = Math.tan(spec.cornerAngleDeg * DEG) / rK;
    return { at: (r) => ({ deg: Math.atan(r * k) / DEG, fNumber }), heights: [], lastHeight: null };
  }
  const rows = [...spec.table].sort((p, q) => p.imageHeightMm - q.imageHeightMm);
  if (rows[0].imageHeightMm > 0) rows.unshift({ imageHeightMm: 0, chiefRayDeg: 0, fNumber });
  const h = rows.map((r) => r.imageHeightMm);
  const a = rows.map((r) => r.chiefRayDeg);
  const n = rows.map((r) => r.fNumber ?? fNumber);
  const last = h.length - 1;
  return {
    at: (r) => {
      if (r >= h[last]) return { deg: a[last], fNumber: n[last] };
      let j = 0;
      while (j + 1 < last && h[j + 1] <= r) j++;
      const t = h[j + 1] > h[j] ? (r - h[j]) / (h[j + 1] - h[j]) : 0;
      return { deg: a[j] + t * (a[j + 1] - a[j]), fNumber: n[j] + t * (n[j + 1] - n[j]) };
    },
    heights: h.slice(1),
    lastHeight: h[last],
  };
}

function validate(input: FieldMapInput): void {
  const d: InputDetail[] = [];
  const { chiefRayDeg, fNumber } = REQUEST_LIMITS;
  const pos = (v: unknown) => typeof v === 'number' && Number.isFinite(v) && v > 0;
  if (!pos(input.sensor?.widthMm)) d.push({ field: 'sensor.widthMm', message: 'the sensor width must be a positive number of mm' });
  if (!pos(input.sensor?.heightMm)) d.push({ field: 'sensor.heightMm', message: 'the sensor height must be a positive number of mm' });
  if (!pos(input.lineNm)) d.push({ field: 'lineNm', message: 'the line wavelength must be a positive number of nm' });
  const spec = input.chiefRay as Record<string, unknown>;
  if ('exitPupilMm' in spec && !pos(spec.exitPupilMm)) d.push({ field: 'exitPupilMm', message: 'the exit-pupil distance must be a positive number of mm' });
  if ('cornerAngleDeg' in spec) {
    const v = spec.cornerAngleDeg as number;
    if (!inRange(v, chiefRayDeg)) d.push({ field: 'cornerAngleDeg', message: `the corner chief-ray angle must be between ${chiefRayDeg[0]} and ${chiefRayDeg[1]} degrees` });
  }
  if ('table' in spec) {
    const rows = spec.table as ChiefRayRow[];
    if (!Array.isArray(rows) || rows.length === 0) d.push({ field: 'chiefRayTable', message: 'the chief-ray table needs at least one row' });
    else {
      const seen = new Set<number>();
      rows.forEach((r, i) => {
        if (!(typeof r.imageHeightMm === 'number' && r.imageHeightMm >= 0 && Number.isFinite(r.imageHeightMm))) d.push({ field: `chiefRayTable.${i}.imageHeightMm`, message: 'the image height must be a number of mm, at least 0' });
        else if (seen.has(r.imageHeightMm)) d.push({ field: `chiefRayTable.${i}.imageHeightMm`, message: `image height ${r.imageHeightMm} mm appears twice` });
        else seen.add(r.imageHeightMm);
        if (!inRange(r.chiefRayDeg, chiefRayDeg)) d.push({ field: `chiefRayTable.${i}.chiefRayDeg`, message: `the chief-ray angle must be between ${chiefRayDeg[0]} and ${chiefRayDeg[1]} degrees` });
        if (r.fNumber !== undefined && !inRange(r.fNumber, fNumber)) d.push({ field: `chiefRayTable.${i}.fNumber`, message: `the f-number must be between ${fNumber[0]} and ${fNumber[1]}` });
      });
    }
  }
  const g = input.grid;
  if (g !== undefined) {
    for (const k of ['nx', 'ny'] as const) {
      const v = g[k];
      if (!(Number.isInteger(v) && v >= 2 && v <= MAX_GRID)) d.push({ field: `grid.${k}`, message: `${k} must be a whole number from 2 to ${MAX_GRID}` });
    }
  }
  (input.thresholds ?? []).forEach((t, i) => {
    if (!(typeof t === 'number' && t >= 0 && t <= 1)) d.push({ field: `thresholds.${i}`, message: 'a threshold is a fraction from 0 to 1' });
  });
  if (d.length > 0) throw new EngineInputError(`Invalid field-map input: ${d[0].message} (${d[0].field}).`, d);
}

/** Monotone cubic Hermite slopes (Fritsch–Carlson) for nodes u with values v. */
function monotoneSlopes(u: number[], v: number[]): number[] {
  const n = u.length;
  const m = new Array<number>(n).fill(0);
  if (n < 2) return m;
  const delta: number[] = [];
  for (let i = 0; i + 1 < n; i++) delta.push((v[i + 1] - v[i]) / (u[i + 1] - u[i]));
  m[0] = delta[0];
  m[n - 1] = delta[n - 2];
  for (let i = 1; i + 1 < n; i++) {
    if (delta[i - 1] * delta[i] <= 0) m[i] = 0;
    else {
      // weighted harmonic mean (Fritsch & Butland), which keeps the cubic monotone
      const h0 = u[i] - u[i - 1];
      const h1 = u[i + 1] - u[i];
      const w1 = 2 * h1 + h0;
      const w2 = h1 + 2 * h0;
      m[i] = (w1 + w2) / (w1 / delta[i - 1] + w2 / delta[i]);
    }
  }
  return m;
}

/** Interpolant of τ in u = r² over the profile nodes. */
export function profileInterpolant(radiusMm: number[], throughput: number[]): (r: number) => number {
  const u = radiusMm.map((r) => r * r);
  const v = throughput;
  const m = monotoneSlopes(u, v);
  const n = u.length;
  let j = 0;
  return (r: number) => {
    const x = r * r;
    if (n === 1 || x <= u[0]) return v[0];
    if (x >= u[n - 1]) return v[n - 1];
    if (x < u[j] || x > u[j + 1]) {
      let lo = 0;
      let hi = n - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (u[mid] <= x) lo = mid;
        else hi = mid;
      }
      j = lo;
    }
    const h = u[j + 1] - u[j];
    const t = (x - u[j]) / h;
    const t2 = t * t;
    const t3 = t2 * t;
    const val = (2 * t3 - 3 * t2 + 1) * v[j] + (t3 - 2 * t2 + t) * h * m[j] + (-2 * t3 + 3 * t2) * v[j + 1] + (t3 - t2) * h * m[j + 1];
    return val < 0 ? 0 : val;
  };
}

/** Length of the circle of radius r inside the quadrant [0, a] × [0, b]. */
export function quadrantArc(r: number, a: number, b: number): number {
  if (r <= 0) return 0;
  const l = r * (Math.PI / 2 - Math.acos(Math.min(1, a / r)) - Math.acos(Math.min(1, b / r)));
  return l > 0 ? l : 0;
}

export function fieldMap(input: FieldMapInput): FieldMapResult {
  validate(input);
  const warnings: string[] = [];
  const c = prepareCurve(input.points);
  const { widthMm: w, heightMm: hgt } = input.sensor;
  const a = w / 2;
  const b = hgt / 2;
  const rK = Math.hypot(a, b);
  const law = chiefRayLaw(input.chiefRay, input.sensor, input.optic.fNumber);
  if (law.lastHeight !== null && law.lastHeight < rK - 1e-9) {
    warnings.push(`The chief-ray table stops at ${law.lastHeight} mm; beyond it, up to the corner at ${rK.toFixed(2)} mm, its last row is used.`);
  }

  const R = Math.max(4, Math.min(200, Math.floor(input.radii ?? DEFAULT_PROFILE_RADII)));
  const nodes: number[] = [];
  for (let k = 0; k < R; k++) nodes.push(rK * Math.sqrt(k / (R - 1)));
  nodes.push(a, b, ...law.heights.filter((h) => h < rK));
  nodes.sort((p, q) => p - q);
  const radiusMm: number[] = [];
  for (const r of nodes) if (radiusMm.length === 0 || r - radiusMm[radiusMm.length - 1] > rK * 1e-9) radiusMm.push(r);
  radiusMm[radiusMm.length - 1] = rK;

  const params: ShiftParams = {
    nEff: input.nEff,
    measuredAoiDeg: input.measuredAoiDeg,
    preShiftNm: input.preShiftNm,
    tempCoeffNmPerC: input.tempCoeffNmPerC,
    tempC: input.tempC,
    refTempC: input.refTempC,
  };
  let covered = true;
  const exactAt = (r: number) => {
    const { deg, fNumber } = law.at(r);
    if (deg > MAX_FIELD_ANGLE_DEG + 1e-9) {
      throw new EngineInputError(`The chief ray reaches ${deg.toFixed(1)}° at ${r.toFixed(2)} mm from the centre; the model stops at ${MAX_FIELD_ANGLE_DEG}°.`, [
        { field: 'chiefRay', message: `the chief-ray angle must stay at or below ${MAX_FIELD_ANGLE_DEG} degrees across the sensor` },
      ]);
    }
    const pupil = buildPupil({ fNumber, obstruction: input.optic.obstruction, fieldAngleDeg: Math.min(deg, MAX_FIELD_ANGLE_DEG), mapping: input.optic.mapping });
    const t = lineThroughput(c, pupil, input.lineNm, params);
    if (!t.covered) covered = false;
    return { r, deg, fNumber, tau: t.throughput };
  };
  let profile = radiusMm.map(exactAt);
  // Refine where the profile bends faster than its nodes follow: the midpoint (in r²)
  // of each interval is computed exactly and kept; an interval whose midpoint the
  // interpolant already predicted within REFINE_TOL is left alone from then on.
  let open = new Set<number>(profile.slice(1).map((p) => p.r));
  while (open.size > 0 && profile.length < MAX_PROFILE_NODES) {
    const interp = profileInterpolant(profile.map((p) => p.r), profile.map((p) => p.tau));
    const added: typeof profile = [];
    const nextOpen = new Set<number>();
    for (let k = 1; k < profile.length && profile.length + added.length < MAX_PROFILE_NODES; k++) {
      if (!open.has(profile[k].r)) continue;
      const mid = Math.sqrt(0.5 * (profile[k - 1].r ** 2 + profile[k].r ** 2));
      if (profile[k].r - profile[k - 1].r < rK * 1e-6) continue;
      const e = exactAt(mid);
      added.push(e);
      if (Math.abs(interp(mid) - e.tau) > REFINE_TOL) {
        nextOpen.add(mid);
        nextOpen.add(profile[k].r);
      }
    }
    if (added.length === 0) break;
    profile = [...profile, ...added].sort((p, q) => p.r - q.r);
    open = nextOpen;
  }
  radiusMm.length = 0;
  const chiefRayDeg: number[] = [];
  const fNumbers: number[] = [];
  const throughput: number[] = [];
  for (const p of profile) {
    radiusMm.push(p.r);
    chiefRayDeg.push(p.deg);
    fNumbers.push(p.fNumber);
    throughput.push(p.tau);
  }
  if (!covered) warnings.push(`At ${input.lineNm} nm the cone reaches beyond the measured range somewhere on the sensor, where transmission is taken as 0.`);

  const tauAt = profileInterpolant(radiusMm, throughput);
  const exact = (r: number) => throughput[radiusMm.findIndex((x) => Math.abs(x - r) <= rK * 1e-9)];

  const nx = input.grid?.nx ?? 64;
  const ny = input.grid?.ny ?? Math.max(2, Math.min(MAX_GRID, Math.round((nx * hgt) / w)));
  const xMm: number[] = [];
  const yMm: number[] = [];
  for (let i = 0; i < nx; i++) xMm.push(-a + ((i + 0.5) * w) / nx);
  for (let j = 0; j < ny; j++) yMm.push(-b + ((j + 0.5) * hgt) / ny);
  const rows: number[][] = [];
  for (let j = 0; j < ny; j++) {
    const row = new Array<number>(nx);
    const y2 = yMm[j] * yMm[j];
    for (let i = 0; i < nx; i++) row[i] = tauAt(Math.sqrt(xMm[i] * xMm[i] + y2));
    rows.push(row);
  }

  // τ over r at fine steps: the share of area at each threshold and the minimum.
  const thresholds = input.thresholds && input.thresholds.length > 0 ? input.thresholds : DEFAULT_THRESHOLDS;
  const shares = thresholds.map(() => 0);
  const dr = rK / SHARE_STEPS;
  for (let k = 0; k < SHARE_STEPS; k++) {
    const r = (k + 0.5) * dr;
    const t = tauAt(r);
    const wgt = quadrantArc(r, a, b) * dr;
    thresholds.forEach((th, i) => {
      if (t >= th) shares[i] += wgt;
    });
  }
  let minI = 0;
  for (let k = 1; k < throughput.length; k++) if (throughput[k] < throughput[minI]) minI = k;

  return {
    centre: throughput[0],
    corner: throughput[throughput.length - 1],
    edgeX: exact(a),
    edgeY: exact(b),
    minimum: { throughput: throughput[minI], radiusMm: radiusMm[minI] },
    areaAtLeast: thresholds.map((threshold, i) => ({ threshold, share: Math.min(1, shares[i] / (a * b)) })),
    grid: { xMm, yMm, throughput: rows },
    profile: { radiusMm, chiefRayDeg, fNumber: fNumbers, throughput },
    covered,
    warnings,
  };
}
