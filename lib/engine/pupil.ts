/**
 * The light cone an optic sends through the filter (docs/model.md §Pupil), reduced to
 * what the model needs: how the pupil's light is distributed over incidence
 * angle. Both ray mappings place a pupil point at angle α from the chief ray
 * (tan α = ρ/2N or sin α = ρ/2N) and at azimuth ψ around it, so the pupil is a
 * uniformly lit spherical annulus around the chief ray, weighted uniformly in
 * U = (ρ/2N)². For a ring of fixed α the spherical law of cosines,
 *   cos θ = cos φ cos α + sin φ sin α cos ψ,
 * gives the fraction of the ring below any θ in closed form, which leaves one
 * smooth integral over U per angle. The result is the exact cumulative weight
 * of θ at a set of bin edges; nothing depends on the filter, so a pupil is
 * built once per optic and reused for every curve, wavelength and n_eff.
 */

import { DEG } from './angles';
import { EngineInputError, type InputDetail } from './errors';
import { MODEL_REACH, REQUEST_LIMITS } from './limits';
import { gaussLegendre01 } from './quadrature';
import type { AngleBin, Mapping, Optic } from './types';

export interface PupilQuadrature {
  /** Bins in sin²θ between the smallest and largest incidence angle (kink points are added). */
  bins?: number;
  /** Gauss–Legendre nodes on each smooth piece of the ring integral. */
  nodesPerPiece?: number;
}

export interface Pupil {
  readonly key: string;
  readonly optic: Required<Optic>;
  readonly fieldRad: number;
  /** Angular radii of the annulus around the chief ray. */
  readonly alphaInRad: number;
  readonly alphaOutRad: number;
  readonly thetaMinRad: number;
  readonly thetaMaxRad: number;
  /** Bin edges in sin²θ, ascending (K + 1 values). */
  readonly sin2Edges: Float64Array;
  /** Cumulative weight at each edge: 0 at the first, 1 at the last. */
  readonly cdf: Float64Array;
  /** Weight of each bin (K values, summing to 1). */
  readonly weights: Float64Array;
  /** Weight of the lower half of each bin in sin²θ, so the model can follow the density's slope. */
  readonly lowerHalf: Float64Array;
  readonly nodesPerPiece: number;
}

export const DEFAULT_BINS = 128;
export const DEFAULT_NODES_PER_PIECE = 20;
/** Extra edges on each side of a kink, at h/2, h/4, … h/2^levels. */
const GRADING_LEVELS = 3;
/** How far a field angle reaches in the model (lib/engine/limits.ts). */
export const MAX_FIELD_ANGLE_DEG = MODEL_REACH.fieldAngleDeg[1];

export function validateOptic(optic: Optic): Required<Optic> {
  const details: InputDetail[] = [];
  const o = optic ?? ({} as Optic);
  const fNumber = o.fNumber;
  const obstruction = o.obstruction ?? 0;
  const fieldAngleDeg = o.fieldAngleDeg ?? 0;
  const mapping: Mapping = o.mapping ?? 'tangent';
  if (typeof fNumber !== 'number' || !Number.isFinite(fNumber) || fNumber < REQUEST_LIMITS.fNumber[0]) {
    details.push({ field: 'optic.fNumber', message: `the f-number must be a number of at least ${REQUEST_LIMITS.fNumber[0]}` });
  }
  if (typeof obstruction !== 'number' || !Number.isFinite(obstruction) || obstruction < 0 || obstruction >= 1) {
    details.push({ field: 'optic.obstruction', message: 'the central obstruction ratio must be at least 0 and below 1' });
  }
  if (typeof fieldAngleDeg !== 'number' || !Number.isFinite(fieldAngleDeg) || fieldAngleDeg < 0 || fieldAngleDeg > MAX_FIELD_ANGLE_DEG) {
    details.push({ field: 'optic.fieldAngleDeg', message: `the field angle must be between 0 and ${MAX_FIELD_ANGLE_DEG} degrees` });
  }
  if (mapping !== 'tangent' && mapping !== 'sine') {
    details.push({ field: 'optic.mapping', message: 'mapping must be "tangent" or "sine"' });
  }
  if (details.length > 0) {
    throw new EngineInputError(`Invalid optic: ${details[0].message}.`, details);
  }
  const alphaOut = rayAngle(1 / (2 * fNumber), mapping);
  if (fieldAngleDeg * DEG + alphaOut >= 89.9 * DEG) {
    throw new EngineInputError('Invalid optic: the light cone reaches grazing incidence on the filter.', [
      { field: 'optic', message: 'field angle plus marginal-ray angle must stay below 89.9 degrees' },
    ]);
  }
  return { fNumber, obstruction, fieldAngleDeg, mapping };
}

/** cos A − cos B without cancellation when the two are close. */
function cosDiff(a: number, b: number): number {
  return -2 * Math.sin(0.5 * (a + b)) * Math.sin(0.5 * (a - b));
}

/** Fraction of a ring at angle α from the chief ray that meets the filter below angle Θ. */
function ringFractionBelow(theta: number, phi: number, alpha: number, sinPhi: number): number {
  const b = sinPhi * Math.sin(alpha);
  if (b < 1e-300) return Math.abs(phi - alpha) < theta ? 1 : 0;
  // cos Θ − cos φ cos α = ½[(cos Θ − cos(φ−α)) + (cos Θ − cos(φ+α))]
  const num = 0.5 * (cosDiff(theta, phi - alpha) + cosDiff(theta, phi + alpha));
  const c = num / b;
  if (c >= 1) return 0;
  if (c <= -1) return 1;
  return Math.acos(c) / Math.PI;
}

interface Geometry {
  phi: number;
  sinPhi: number;
  uIn: number;
  uOut: number;
  mapping: Mapping;
}

/** The ray's angle from the chief ray, radians, at k = ρ/2N: tan α = k (tangent mapping) or sin α = k (sine). */
function rayAngle(k: number, mapping: Mapping): number {
  return mapping === 'tangent' ? Math.atan(k) : Math.asin(Math.min(1, k));
}

function alphaOfU(g: Geometry, u: number): number {
  return rayAngle(Math.sqrt(u), g.mapping);
}

function uOfAlpha(g: Geometry, a: number): number {
  if (g.mapping === 'tangent') {
    const t = Math.tan(a);
    return t * t;
  }
  const s = Math.sin(a);
  return s * s;
}

/**
 * Cumulative pupil weight with incidence angle below Θ. The ring fraction has
 * square-root kinks where a ring first touches or leaves the circle θ = Θ
 * (α = |Θ − φ| and α = Θ + φ); the U integral is split there and each piece is
 * mapped through a smoothstep so the kinks become smooth and Gauss–Legendre
 * converges spectrally.
 */
function cdfAtTheta(g: Geometry, theta: number, nodes: number): number {
  if (theta <= 0) return 0;
  const breaks = [g.uIn];
  for (const a of [Math.abs(theta - g.phi), theta + g.phi]) {
    if (a < Math.PI / 2) {
      const u = uOfAlpha(g, a);
      if (u > g.uIn && u < g.uOut) breaks.push(u);
    }
  }
  breaks.push(g.uOut);
  breaks.sort((p, q) => p - q);
  const { nodes: t, weights: w } = gaussLegendre01(nodes);
  let sum = 0;
  for (let p = 0; p + 1 < breaks.length; p++) {
    const a = breaks[p];
    const len = breaks[p + 1] - a;
    if (len <= 0) continue;
    let piece = 0;
    for (let i = 0; i < t.length; i++) {
      const ti = t[i];
      const s = ti * ti * (3 - 2 * ti);
      const ds = 6 * ti * (1 - ti);
      piece += w[i] * ds * ringFractionBelow(theta, g.phi, alphaOfU(g, a + len * s), g.sinPhi);
    }
    sum += piece * len;
  }
  const v = sum / (g.uOut - g.uIn);
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

function geometryOf(o: Required<Optic>): Geometry {
  const phi = o.fieldAngleDeg * DEG;
  const k = 1 / (2 * o.fNumber);
  return {
    phi,
    sinPhi: Math.sin(phi),
    uIn: (o.obstruction * k) ** 2,
    uOut: k * k,
    mapping: o.mapping,
  };
}

const pupilCache = new Map<string, Pupil>();
// A field map holds one pupil per profile radius (up to about 160), so the
// cache keeps a few maps' worth; a pupil is about 7 kB.
const PUPIL_CACHE_LIMIT = 512;

export function buildPupil(optic: Optic, quadrature: PupilQuadrature = {}): Pupil {
  const o = validateOptic(optic);
  const whole = (v: number | undefined, fallback: number, min: number, max: number) =>
    Number.isFinite(v) ? Math.min(max, Math.max(min, Math.floor(v as number))) : fallback;
  const bins = whole(quadrature.bins, DEFAULT_BINS, 8, 8192);
  const nodesPerPiece = whole(quadrature.nodesPerPiece, DEFAULT_NODES_PER_PIECE, 4, 200);
  const key = JSON.stringify([o.fNumber, o.obstruction, o.fieldAngleDeg, o.mapping, bins, nodesPerPiece]);
  const hit = pupilCache.get(key);
  if (hit) {
    // refresh recency so the cache behaves as a small LRU
    pupilCache.delete(key);
    pupilCache.set(key, hit);
    return hit;
  }

  const g = geometryOf(o);
  const alphaIn = alphaOfU(g, g.uIn);
  const alphaOut = alphaOfU(g, g.uOut);
  const phi = g.phi;
  const thetaMin = phi <= alphaIn ? alphaIn - phi : phi <= alphaOut ? 0 : phi - alphaOut;
  const thetaMax = phi + alphaOut;

  const qMin = Math.sin(thetaMin) ** 2;
  const qMax = Math.sin(thetaMax) ** 2;
  const span = qMax - qMin;
  const edges: number[] = [];
  for (let k = 0; k <= bins; k++) edges.push(qMin + (span * k) / bins);
  // Where a ring first touches or leaves the circle θ = Θ the density of sin²θ
  // changes like a square root. Those points become edges, with bins graded
  // geometrically towards them so the straight density assumed inside a bin holds.
  const h = span / bins;
  const kinks = [Math.abs(phi - alphaIn), phi + alphaIn, Math.abs(phi - alphaOut), phi + alphaOut, thetaMin]
    .map((a) => Math.sin(a) ** 2)
    .filter((q) => q >= qMin && q <= qMax);
  for (const q of kinks) {
    edges.push(q);
    for (let level = 1; level <= GRADING_LEVELS; level++) {
      const d = h / 2 ** level;
      if (q - d > qMin) edges.push(q - d);
      if (q + d < qMax) edges.push(q + d);
    }
  }
  edges.sort((p, q) => p - q);
  // drop edges that nearly coincide (a kink on a regular edge)
  const merged = [edges[0]];
  for (let i = 1; i < edges.length; i++) {
    if (edges[i] - merged[merged.length - 1] > span * 1e-9) merged.push(edges[i]);
  }
  merged[merged.length - 1] = qMax;

  const sin2Edges = Float64Array.from(merged);
  const K = sin2Edges.length - 1;
  const cdf = new Float64Array(K + 1);
  cdf[K] = 1;
  for (let k = 1; k < K; k++) cdf[k] = cdfAtTheta(g, Math.asin(Math.sqrt(sin2Edges[k])), nodesPerPiece);
  for (let k = 1; k <= K; k++) if (cdf[k] < cdf[k - 1]) cdf[k] = cdf[k - 1];
  const weights = new Float64Array(K);
  const lowerHalf = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    weights[k] = cdf[k + 1] - cdf[k];
    const mid = cdfAtTheta(g, Math.asin(Math.sqrt(0.5 * (sin2Edges[k] + sin2Edges[k + 1]))), nodesPerPiece);
    lowerHalf[k] = Math.min(weights[k], Math.max(0, mid - cdf[k]));
  }

  const pupil: Pupil = {
    key,
    optic: o,
    fieldRad: phi,
    alphaInRad: alphaIn,
    alphaOutRad: alphaOut,
    thetaMinRad: thetaMin,
    thetaMaxRad: thetaMax,
    sin2Edges,
    cdf,
    weights,
    lowerHalf,
    nodesPerPiece,
  };
  pupilCache.set(key, pupil);
  if (pupilCache.size > PUPIL_CACHE_LIMIT) pupilCache.delete(pupilCache.keys().next().value as string);
  return pupil;
}

/** Exact cumulative weight of the pupil below an incidence angle (degrees). */
export function pupilWeightBelow(pupil: Pupil, thetaDeg: number): number {
  const t = thetaDeg * DEG;
  if (t <= pupil.thetaMinRad) return 0;
  if (t >= pupil.thetaMaxRad) return 1;
  return cdfAtTheta(geometryOf(pupil.optic), t, pupil.nodesPerPiece);
}

/** Weight of the pupil's light per incidence-angle bin, for charts; bins sum to 1. */
export function angleHistogram(pupil: Pupil, binDeg = 0.5): AngleBin[] {
  if (!(binDeg > 0)) throw new EngineInputError('The histogram bin width must be positive.', [{ field: 'binDeg', message: 'must be > 0' }]);
  const lo = Math.floor(pupil.thetaMinRad / DEG / binDeg + 1e-9);
  const hi = Math.max(lo + 1, Math.ceil(pupil.thetaMaxRad / DEG / binDeg - 1e-9));
  const out: AngleBin[] = [];
  let prev = 0;
  for (let b = lo; b < hi; b++) {
    const next = b + 1 === hi ? 1 : pupilWeightBelow(pupil, (b + 1) * binDeg);
    out.push({ deg: (b + 0.5) * binDeg, weight: Math.max(0, next - prev) });
    prev = next;
  }
  return out;
}

/** Marginal-ray angle on axis, degrees (tan θ = 1/2N for the tangent mapping). */
export function marginalRayDeg(fNumber: number, mapping: Mapping = 'tangent'): number {
  return rayAngle(1 / (2 * fNumber), mapping) / DEG;
}
