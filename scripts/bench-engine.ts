/**
 * Engine speed figures, each beside its target. Not a test: timings depend on
 * the machine. Run with `npx tsx scripts/bench-engine.ts`.
 */

import { performance } from 'node:perf_hooks';
import { bestPreShift, coneCurve, lineThroughput } from '../lib/engine/cone';
import { prepareCurve } from '../lib/engine/curve';
import { buildPupil } from '../lib/engine/pupil';
import { readCurveText } from '../lib/engine/reader';
import { runConeModel } from '../lib/engine/cone-study';
import type { CurvePoints } from '../lib/engine/types';

/** Deterministic generator so runs compare like with like. */
function rng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** A 3-cavity-like flat-topped passband with ripple and noise, 2000 samples. */
function syntheticCurve(n = 2000, cwl = 656.8, fwhm = 5): CurvePoints {
  const r = rng(7);
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  const lo = cwl - 25;
  const step = 50 / (n - 1);
  for (let i = 0; i < n; i++) {
    const x = lo + i * step;
    const u = (2 * (x - cwl)) / fwhm;
    const t = 0.92 / (1 + u ** 12) * (1 + 0.01 * Math.sin(x * 7)) + 0.0005 * (r() - 0.5);
    wavelengthNm.push(x);
    transmission.push(Math.max(0, t));
  }
  return { wavelengthNm, transmission };
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

function time(fn: () => unknown, runs: number): number {
  for (let i = 0; i < Math.min(5, runs); i++) fn();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    t.push(performance.now() - t0);
  }
  return median(t);
}

const points = syntheticCurve();
const curve = prepareCurve(points);
const optic = { fNumber: 2, obstruction: 0.35, fieldAngleDeg: 12 };
const params = { nEff: 2.05 };
const t0 = performance.now();
const pupil = buildPupil(optic);
const pupilBuildMs = performance.now() - t0;

const lineMs = time(() => lineThroughput(curve, pupil, 656.28, params), 2000);
const lineRawMs = time(() => lineThroughput(points, pupil, 656.28, params), 500);
const coneMs = time(() => coneCurve(curve, pupil, params), 200);
const preShiftMs = time(() => bestPreShift(curve, pupil, 656.28, params), 100);
const studyMs = time(() => runConeModel({ points, optic, nEff: 2.05, lines: ['Ha'], includeCurve: true }), 50);

// 200 000-row file: tab-separated, descending, percent, with a header
const rows: string[] = ['# synthetic scan', 'Wavelength (nm)\tT (%)'];
for (let i = 0; i < 200_000; i++) {
  const x = 1100 - i * 0.004;
  rows.push(`${x.toFixed(3)}\t${(50 + 40 * Math.sin(x)).toFixed(4)}`);
}
const file = new TextEncoder().encode(rows.join('\r\n'));
global.gc?.();
const heapBefore = process.memoryUsage().heapUsed;
let peakHeap = heapBefore;
const sampler = setInterval(() => (peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed)), 1);
const p0 = performance.now();
const read = readCurveText(file);
const parseMs = performance.now() - p0;
clearInterval(sampler);
peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
const parseTimes = [parseMs, ...[1, 2].map(() => {
  const s = performance.now();
  readCurveText(file);
  return performance.now() - s;
})];

const round = (v: number, d = 3) => Number(v.toFixed(d));
console.log(
  JSON.stringify(
    {
      machine: { cpus: (await import('node:os')).cpus().length, node: process.version },
      curveSamples: points.wavelengthNm.length,
      pupilBins: pupil.weights.length,
      figures: [
        { name: 'pupil build (once per optic, then cached)', ms: round(pupilBuildMs), target: 'none' },
        { name: 'one line throughput, prepared curve (median)', ms: round(lineMs, 4), targetMs: 0.5 },
        { name: 'one line throughput from raw points (median)', ms: round(lineRawMs, 4), targetMs: 0.5 },
        { name: 'cone-averaged curve (median)', ms: round(coneMs), targetMs: 5 },
        { name: 'best pre-shift (median)', ms: round(preShiftMs), targetMs: 20 },
        { name: 'full cone study incl. curve (median)', ms: round(studyMs), target: 'none' },
        { name: `parse ${read.rowCount}-row file (${(file.length / 1048576).toFixed(2)} MB), median of 3`, ms: round(median(parseTimes), 1), targetMs: 1000 },
        { name: 'parse heap growth', mb: round((peakHeap - heapBefore) / 1048576, 1), targetMb: 200 },
      ],
    },
    null,
    2,
  ),
);
