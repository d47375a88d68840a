/**
 * A cone study: one curve run through one optic, answered in exactly the shape
 * of the POST /api/model/cone response.
 */

import { bestPreShift, coneCurve, lineThroughput, shiftFrame, validateShift, DEFAULT_REF_TEMP_C } from './cone';
import { cleanPoints, prepareCleanCurve, type PreparedCurve } from './curve';
import { EngineInputError, type InputDetail } from './errors';
import { dopplerShift, findLine, LINES, neighboursOf, SPEED_OF_LIGHT_KMS } from './lines';
import { halfMaximumEdges } from './metrics';
import { angleHistogram, buildPupil, validateOptic } from './pupil';
import { skyStudy } from './sky';
import { redshift, weightedLines, weightedTotal } from './target';
import type { ConeLineResult, ConeModelInput, ConeModelResult, NeighbourResult, TargetTotal } from './types';

/** Id given to a line requested by wavelength rather than from the catalogue. */
export const CUSTOM_LINE_ID = 'custom';
/** τ below this counts as no signal: the speed-equivalent f-number is then infinite (null). */
const ZERO_THROUGHPUT = 1e-12;

interface Target {
  id: string;
  label: string;
  restNm: number;
}

function validate(input: ConeModelInput): void {
  const details: InputDetail[] = [...validateShift(input)];
  try {
    validateOptic(input.optic);
  } catch (e) {
    if (e instanceof EngineInputError) details.push(...e.details);
    else throw e;
  }
  if (input.lines !== undefined) {
    if (!Array.isArray(input.lines)) details.push({ field: 'lines', message: 'lines must be a list of line ids' });
    else
      input.lines.forEach((id, i) => {
        if (typeof id !== 'string' || !findLine(id)) {
          details.push({ field: 'lines', index: i, message: `"${String(id)}" is not one of ${LINES.map((l) => l.id).join(', ')}` });
        }
      });
  }
  if (input.lineNm !== undefined && (typeof input.lineNm !== 'number' || !Number.isFinite(input.lineNm) || input.lineNm <= 0)) {
    details.push({ field: 'lineNm', message: 'the line wavelength must be a positive number of nm' });
  }
  const v = input.radialVelocityKms;
  if (v !== undefined && (typeof v !== 'number' || !Number.isFinite(v) || Math.abs(v) > 0.1 * SPEED_OF_LIGHT_KMS)) {
    details.push({ field: 'radialVelocityKms', message: 'the radial velocity must be a number within ±29 979 km/s' });
  }
  const z = input.z;
  if (z !== undefined && (typeof z !== 'number' || !Number.isFinite(z) || z < -0.1 || z > 1)) {
    details.push({ field: 'z', message: 'the redshift z must be a number from −0.1 to 1' });
  }
  if (z !== undefined && v !== undefined) details.push({ field: 'z', message: 'give either z or radialVelocityKms, not both' });
  for (const [id, w] of Object.entries(input.lineWeights ?? {})) {
    if (id !== CUSTOM_LINE_ID && !findLine(id)) details.push({ field: `lineWeights.${id}`, message: `"${id}" is not a line id (${LINES.map((l) => l.id).join(', ')}, or "${CUSTOM_LINE_ID}" for lineNm)` });
    else if (!(typeof w === 'number' && Number.isFinite(w) && w >= 0)) details.push({ field: `lineWeights.${id}`, message: 'a line weight must be a number of at least 0' });
  }
  if (details.length > 0) {
    const unknown = details.find((d) => d.field === 'lines');
    const first = unknown ?? details[0];
    throw new EngineInputError(unknown ? `Unknown emission line: ${first.message}.` : `Invalid model input: ${first.message}.`, details);
  }
}

function chooseTargets(input: ConeModelInput, c: PreparedCurve, sM: number, shift: number, warnings: string[]): Target[] {
  const targets: Target[] = [];
  for (const id of input.lines ?? []) {
    if (targets.some((t) => t.id === id)) continue;
    const l = findLine(id)!;
    targets.push({ id, label: l.name, restNm: l.airNm });
  }
  if (input.lineNm !== undefined) targets.push({ id: CUSTOM_LINE_ID, label: `${input.lineNm} nm`, restNm: input.lineNm });
  if (targets.length > 0) return targets;
  const { leftNm, rightNm } = halfMaximumEdges(c);
  const centre = leftNm !== null && rightNm !== null ? 0.5 * (leftNm + rightNm) : c.x[c.peakIndex];
  const cwl = centre / sM + shift;
  let best = LINES[0];
  for (const l of LINES) if (Math.abs(l.airNm - cwl) < Math.abs(best.airNm - cwl)) best = l;
  warnings.push(`No line was given; ${best.name} (${best.airNm} nm), the catalogued line nearest the passband centre, was used.`);
  return [{ id: best.id, label: best.name, restNm: best.airNm }];
}

function neighbourTargets(targets: Target[], fwhm: number | null): Target[] {
  const taken = new Set(targets.map((t) => t.id));
  const out: Target[] = [];
  const add = (id: string, label: string, restNm: number) => {
    if (taken.has(id)) return;
    taken.add(id);
    out.push({ id, label, restNm });
  };
  for (const t of targets) {
    if (t.id === CUSTOM_LINE_ID) {
      const window = Math.max(5, 3 * (fwhm ?? 0));
      for (const l of LINES) {
        const d = Math.abs(l.airNm - t.restNm);
        if (d > 0.05 && d <= window) add(l.id, l.name, l.airNm);
      }
    } else {
      for (const l of neighboursOf(t.id)) add(l.id, l.name, l.airNm);
    }
  }
  return out;
}

function trapezoid(x: ArrayLike<number>, y: ArrayLike<number>): number {
  let s = 0;
  for (let i = 1; i < x.length; i++) s += 0.5 * (x[i] - x[i - 1]) * (y[i] + y[i - 1]);
  return s;
}

/** The s and p indices moved with n_eff inside its uncertainty (both by the same step). */
function movedPolarised(sp: ConeModelInput['nEffPolarised'], step: number): ConeModelInput['nEffPolarised'] {
  if (!sp || step === 0) return sp;
  return { s: Math.min(4, Math.max(1, sp.s + step)), p: Math.min(4, Math.max(1, sp.p + step)) };
}

export function runConeModel(input: ConeModelInput): ConeModelResult {
  validate(input);
  const warnings: string[] = [];
  const cleaned = cleanPoints(input.points);
  warnings.push(...cleaned.warnings);
  const c = prepareCleanCurve(Float64Array.from(cleaned.points.wavelengthNm), Float64Array.from(cleaned.points.transmission));
  const pupil = buildPupil(input.optic);
  const params = {
    nEff: input.nEff,
    nEffPolarised: input.nEffPolarised,
    measuredAoiDeg: input.measuredAoiDeg,
    preShiftNm: input.preShiftNm,
    tempCoeffNmPerC: input.tempCoeffNmPerC,
    tempC: input.tempC,
    refTempC: input.refTempC,
  };
  const { sM, shift } = shiftFrame(params);
  if (input.tempCoeffNmPerC !== undefined && input.tempC !== undefined && input.refTempC === undefined) {
    warnings.push(`No reference temperature was given; the temperature shift uses ${DEFAULT_REF_TEMP_C} °C.`);
  }
  if (input.tempC !== undefined && input.tempCoeffNmPerC === undefined) {
    warnings.push('A temperature was given without a temperature coefficient, so no temperature shift was applied.');
  }
  if (!(c.peak > 0)) warnings.push('The curve never rises above zero; every throughput is zero.');

  const targets = chooseTargets(input, c, sM, shift, warnings);
  const v = input.radialVelocityKms ?? 0;
  const N = pupil.optic.fNumber;

  const move = (restNm: number) => (input.z !== undefined ? redshift(restNm, input.z) : dopplerShift(restNm, v));
  const evaluate = (t: Target) => {
    const wavelengthNm = move(t.restNm);
    const r = lineThroughput(c, pupil, wavelengthNm, params);
    if (!r.covered) {
      warnings.push(`${t.label} at ${wavelengthNm.toFixed(3)} nm: the cone reaches beyond the measured range, where transmission is taken as 0.`);
    }
    return { wavelengthNm, ...r };
  };

  const lines: ConeLineResult[] = targets.map((t) => {
    const r = evaluate(t);
    return {
      id: t.id,
      wavelengthNm: r.wavelengthNm,
      collimated: r.collimated,
      throughput: r.throughput,
      speedEquivalentFNumber: r.throughput > ZERO_THROUGHPUT && c.peak > 0 ? N * Math.sqrt(c.peak / r.throughput) : null,
    };
  });

  const primary = lines[0];
  const best = bestPreShift(c, pupil, primary.wavelengthNm, params);
  if (!best) warnings.push('The curve has no FWHM, so the best pre-shift cannot be searched.');

  const { leftNm, rightNm } = halfMaximumEdges(c);
  const fwhm = leftNm !== null && rightNm !== null ? (rightNm - leftNm) / sM : null;
  const neighbours: NeighbourResult[] = neighbourTargets(targets, fwhm).map((t) => {
    const r = evaluate(t);
    return { id: t.id, wavelengthNm: r.wavelengthNm, collimated: r.collimated, throughput: r.throughput };
  });

  const cone = coneCurve(c, pupil, params);
  let contrast: number | null = null;
  let conePeak = 0;
  for (const t of cone.transmission) if (t > conePeak) conePeak = t;
  if (conePeak > 0) {
    const wCone = trapezoid(cone.wavelengthNm, cone.transmission) / conePeak;
    contrast = wCone > 0 ? primary.throughput / wCone : null;
  }
  if (contrast === null) warnings.push('The cone-averaged curve has no effective bandwidth, so the contrast figure is undefined.');
  if (!cone.covered) warnings.push('The measured range is narrower than the cone shift; the cone-averaged curve assumes zero transmission outside it.');

  // Error bars (docs/model.md): a wavelength-scale error δ moves the measured curve by δ, which the model
  // sees exactly as a pre-shift of δ; n_eff moves within its own uncertainty. Each line's throughput is
  // evaluated at the corners (−u, 0, +u) × (n − σ, n, n + σ) and the lowest and highest kept.
  const u = input.wavelengthUncertaintyNm ?? 0;
  const sn = input.nEffUncertainty ?? 0;
  let bestRange: [number, number] | undefined;
  if (u > 0 || sn > 0) {
    const deltas = u > 0 ? [-u, 0, u] : [0];
    const indices = (sn > 0 ? [input.nEff - sn, input.nEff, input.nEff + sn] : [input.nEff]).filter((n) => n >= 1 && n <= 4);
    lines.forEach((line, i) => {
      let lo = Infinity;
      let hi = -Infinity;
      for (const d of deltas) {
        for (const n of indices) {
          const t = lineThroughput(c, pupil, line.wavelengthNm, { ...params, nEff: n, nEffPolarised: movedPolarised(input.nEffPolarised, n - input.nEff), preShiftNm: (input.preShiftNm ?? 0) + d }).throughput;
          lo = Math.min(lo, t);
          hi = Math.max(hi, t);
        }
      }
      const sef = (t: number) => (t > ZERO_THROUGHPUT && c.peak > 0 ? N * Math.sqrt(c.peak / t) : null);
      lines[i] = { ...line, throughputRange: [lo, hi], speedEquivalentRange: [sef(hi), sef(lo)] };
    });
    if (best) {
      // the best pre-shift undoes a wavelength error one for one; n_eff moves it through the cone
      let lo = best.nm - u;
      let hi = best.nm + u;
      for (const n of indices) {
        if (n === input.nEff) continue;
        const b = bestPreShift(c, pupil, primary.wavelengthNm, { ...params, nEff: n, nEffPolarised: movedPolarised(input.nEffPolarised, n - input.nEff) });
        if (b) {
          lo = Math.min(lo, b.nm - u);
          hi = Math.max(hi, b.nm + u);
        }
      }
      bestRange = [Number(lo.toFixed(4)), Number(hi.toFixed(4))];
    }
  }

  const result: ConeModelResult = {
    lines,
    bestPreShift: best ? { nm: best.nm, throughput: best.throughput, ...(bestRange ? { nmRange: bestRange } : {}) } : null,
    neighbours,
    contrast,
    angleHistogram: angleHistogram(pupil, 0.5),
    warnings: [...new Set(warnings)],
  };
  if (input.z !== undefined || input.doublets || input.lineWeights || targets.length > 1) {
    result.target = targetTotal(input, targets, evaluate);
  }
  if (input.sky) result.sky = skyStudy(c, pupil, params, primary.wavelengthNm, primary.throughput, input.sky, warnings);
  result.warnings = [...new Set(warnings)];
  if (input.includeCurve) result.coneCurve = { wavelengthNm: cone.wavelengthNm, transmission: cone.transmission };
  return result;
}

/** Each target line (plus doublet partners when asked) with its weight, and the weighted total. */
function targetTotal(input: ConeModelInput, targets: Target[], evaluate: (t: Target) => { wavelengthNm: number; throughput: number }): TargetTotal {
  const restOf = new Map(targets.map((t) => [t.id, t]));
  const weights = weightedLines(targets.map((t) => t.id), input.lineWeights ?? {}, input.doublets ?? false);
  const lines = weights.map((w) => {
    const t = restOf.get(w.id) ?? { id: w.id, label: findLine(w.id)!.name, restNm: findLine(w.id)!.airNm };
    const r = evaluate(t);
    return { id: w.id, wavelengthNm: r.wavelengthNm, weight: w.weight, throughput: r.throughput, fromDoublet: w.fromDoublet };
  });
  const z = input.z ?? (input.radialVelocityKms ?? 0) / SPEED_OF_LIGHT_KMS;
  return { z, lines, total: weightedTotal(lines) };
}
