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
import { SHAPES, type HostileFigure } from './bench-reader-hostile';
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

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

/**
 * Median per-call time over batches, both as wall clock and as CPU time of this
 * process. On a shared machine the wall clock includes time spent waiting for
 * a core, so the CPU figure is the fairer one; both are printed.
 */
function time(fn: () => unknown, batches: number, perBatch = 1): { wallMs: number; cpuMs: number } {
  for (let i = 0; i < Math.min(5, batches) * perBatch; i++) fn();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let b = 0; b < batches; b++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    for (let i = 0; i < perBatch; i++) fn();
    wall.push((performance.now() - t0) / perBatch);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000 / perBatch);
  }
  return { wallMs: median(wall), cpuMs: median(cpu) };
}

const points = syntheticCurve();
const curve = prepareCurve(points);
const optic = { fNumber: 2, obstruction: 0.35, fieldAngleDeg: 12 };
const params = { nEff: 2.05 };
const t0 = performance.now();
const pupil = buildPupil(optic);
const pupilBuildMs = performance.now() - t0;

const lineMs = time(() => lineThroughput(curve, pupil, 656.28, params), 40, 50);
const lineRawMs = time(() => lineThroughput(points, pupil, 656.28, params), 40, 20);
const coneMs = time(() => coneCurve(curve, pupil, params), 60, 3);
const preShiftMs = time(() => bestPreShift(curve, pupil, 656.28, params), 40, 2);
const studyMs = time(() => runConeModel({ points, optic, nEff: 2.05, lines: ['Ha'], includeCurve: true }), 30);

// 200 000-row file: tab-separated, descending, percent, with a header
const rows: string[] = ['# synthetic scan', 'Wavelength (nm)\tT (%)'];
for (let i = 0; i < 200_000; i++) {
  const x = 1100 - i * 0.004;
  rows.push(`${x.toFixed(3)}\t${(50 + 40 * Math.sin(x)).toFixed(4)}`);
}
const file = new TextEncoder().encode(rows.join('\r\n'));
const rssBefore = process.resourceUsage().maxRSS;
const heapBefore = process.memoryUsage().heapUsed;
const parse = time(() => readCurveText(file), 5);
const read = readCurveText(file);
const peakRssGrowthMb = (process.resourceUsage().maxRSS - rssBefore) / 1024;
const heapAfterMb = (process.memoryUsage().heapUsed - heapBefore) / 1048576;

const round = (v: number, d = 3) => Number(v.toFixed(d));
const fig = (name: string, t: { wallMs: number; cpuMs: number }, targetMs?: number) => ({
  name,
  cpuMs: round(t.cpuMs, 4),
  wallMs: round(t.wallMs, 4),
  ...(targetMs !== undefined ? { targetMs, meets: t.cpuMs <= targetMs } : {}),
});
const os = await import('node:os');
console.log(
  JSON.stringify(
    {
      machine: { cpus: os.cpus().length, node: process.version, loadAverage1m: round(os.loadavg()[0], 2) },
      curveSamples: points.wavelengthNm.length,
      pupilBins: pupil.weights.length,
      figures: [
        { name: 'pupil build (once per optic, then cached)', wallMs: round(pupilBuildMs) },
        fig('one line throughput, prepared curve (median)', lineMs, 0.5),
        fig('one line throughput from raw points (median)', lineRawMs, 0.5),
        fig('cone-averaged curve (median)', coneMs, 5),
        fig('best pre-shift (median)', preShiftMs, 20),
        fig('full cone study incl. curve, pre-shift, neighbours, histogram (median)', studyMs),
        fig(`parse ${read.rowCount}-row file (${(file.length / 1048576).toFixed(2)} MB, median of 5)`, parse, 1000),
        {
          name: 'parse memory: growth of peak RSS / of live heap',
          peakRssGrowthMb: round(peakRssGrowthMb, 1),
          heapGrowthMb: round(heapAfterMb, 1),
          targetMb: 200,
          meets: peakRssGrowthMb < 200,
        },
      ],
    },
    null,
    2,
  ),
);

/**
 * Field map (whole sensor): a 200 × 150 map of an APS-C-sized sensor with the
 * exit pupil 40 mm away, cold (a new optic, so one pupil per profile radius) and
 * warm (the same optic again, pupils cached). Targets ≤ 300 ms cold, ≤ 30 ms warm.
 */
async function benchFieldMap() {
  const { fieldMap } = await import('../lib/engine/field-map');
  const fmPoints = syntheticCurve();
  const run = (fNumber: number) =>
    fieldMap({
      points: fmPoints,
      optic: { fNumber, obstruction: 0.36 },
      sensor: { widthMm: 23.5, heightMm: 15.6 },
      chiefRay: { exitPupilMm: 40 },
      nEff: 2.05,
      lineNm: 656.28,
      grid: { nx: 200, ny: 150 },
    });
  run(3.1); // JIT warm-up on an optic not used below
  const cold: number[] = [];
  const coldCpu: number[] = [];
  let radii = 0;
  for (let k = 0; k < 7; k++) {
    // every cold run is a new f-number, so none of its pupils is cached
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    radii = run(2.5 + 0.013 * k).profile.radiusMm.length;
    cold.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    coldCpu.push((c.user + c.system) / 1000);
  }
  const warm = time(() => run(2.5), 20, 3);
  const r3 = (v: number) => Number(v.toFixed(3));
  console.log(
    JSON.stringify(
      {
        section: 'field map 200 × 150',
        profileRadii: radii,
        figures: [
          { name: 'field map, cold (new optic: one pupil per radius), median of 7', cpuMs: r3(median(coldCpu)), wallMs: r3(median(cold)), targetMs: 300, meets: median(coldCpu) <= 300 },
          { name: 'field map, warm (pupils cached), median', cpuMs: r3(warm.cpuMs), wallMs: r3(warm.wallMs), targetMs: 30, meets: warm.cpuMs <= 30 },
        ],
      },
      null,
      2,
    ),
  );
}
await benchFieldMap();
// Hostile files: each shape at 1 MB and 5 MB, each read in a fresh process so
// its memory growth is its own. Target: any 5 MB file read or refused in ≤ 1 s
// (CPU) and ≤ 200 MB growth of peak RSS; the 1 MB figures show growth is linear.
const runner = fileURLToPath(new URL('./bench-reader-hostile.ts', import.meta.url));
const hostile: (HostileFigure & { meets: boolean })[] = [];
for (const shape of Object.keys(SHAPES)) {
  for (const bytes of [1 << 20, 5 << 20]) {
    const out = execFileSync(process.execPath, ['--import', 'tsx', '--expose-gc', runner, shape, String(bytes)], { encoding: 'utf8' });
    const f = JSON.parse(out.trim().split('\n').pop()!) as HostileFigure;
    hostile.push({ ...f, meets: f.cpuMs <= 1000 && f.peakRssGrowthMb <= 200 });
  }
}
console.log('\nHostile files (target: read or refused in ≤ 1000 ms CPU and ≤ 200 MB growth of peak RSS)');
console.table(
  hostile.map((f) => ({
    shape: f.shape,
    MB: round(f.bytes / 1048576, 2),
    cpuMs: f.cpuMs,
    wallMs: f.wallMs,
    rssMb: f.peakRssGrowthMb,
    heapMb: f.heapGrowthMb,
    meets: f.meets,
    outcome: f.outcome.slice(0, 60),
  })),
);
console.log(`all hostile shapes meet the target: ${hostile.every((f) => f.meets)}`);
