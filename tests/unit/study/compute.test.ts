import { describe, expect, it } from 'vitest';
import { computeStudy, coneRequestBody, studyCurve } from '@/lib/study/compute';
import { studyCsv } from '@/lib/study/tables';
import type { StudyCurve, StudySettings } from '@/lib/study/types';
import { verdictFor } from '@/lib/study/verdict';

const HA = 656.28;

/** An ideal flat-top filter, T = peak inside [cwl ± w/2] with edges 1 pm wide, sampled every 0.05 nm. */
function flatTop(cwl: number, w: number, peak = 0.9, key = 'p1'): StudyCurve {
  const x: number[] = [];
  const y: number[] = [];
  for (let v = cwl - 30; v <= cwl + 30 + 1e-9; v += 0.05) {
    x.push(Math.round(v * 1000) / 1000);
    y.push(Math.abs(v - cwl) <= w / 2 ? peak : 0);
  }
  // Edges steep but not vertical, so the samples stay strictly increasing.
  const lo = cwl - w / 2;
  const hi = cwl + w / 2;
  const pts = x.map((v, i) => [v, y[i]] as [number, number]).filter(([v]) => Math.abs(v - lo) > 0.002 && Math.abs(v - hi) > 0.002);
  pts.push([lo - 0.0005, 0], [lo + 0.0005, peak], [hi - 0.0005, peak], [hi + 0.0005, 0]);
  pts.sort((a, b) => a[0] - b[0]);
  return {
    key,
    id: null,
    label: `Ideal ${w} nm`,
    source: 'pasted',
    status: null,
    lines: ['Ha'],
    aoiDeg: 0,
    nEff: null,
    tempC: null,
    cwlNm: cwl,
    fwhmNm: w,
    peakT: peak,
    points: { wavelengthNm: pts.map((p) => p[0]), transmission: pts.map((p) => p[1]) },
    set: null,
  };
}

const settings = (over: Partial<StudySettings> = {}): StudySettings => ({
  optic: { id: null, name: 'Typed optic', fNumber: 2, obstruction: 0, fieldAngleDeg: 0, mapping: 'tangent' },
  nEff: 2,
  preShiftNm: 0,
  tempC: null,
  tempCoeffNmPerC: null,
  refTempC: null,
  line: { id: 'Ha' },
  radialVelocityKms: 0,
  ...over,
});

/**
 * Analytic reference from docs/model.md §Pupil alone: on axis (tangent mapping, no
 * obstruction) tan θ = ρ/2N with the pupil uniform in ρ², so P(θ ≤ t) = tan²t·4N².
 * A flat-top at [a, b] passes the line at λ when λ/s(θ) ∈ [a, b].
 */
function analyticTau(N: number, n: number, a: number, b: number, peak: number): number {
  const cdf = (t: number) => Math.min(1, Math.tan(t) ** 2 * 4 * N * N);
  const theta = (s: number) => (s >= 1 ? 0 : Math.asin(Math.min(1, n * Math.sqrt(1 - s * s))));
  const upper = HA / b > 1 ? 0 : cdf(theta(HA / b));
  const lower = HA / a >= 1 ? 0 : cdf(theta(HA / a));
  return peak * Math.max(0, upper - lower);
}

describe('a study of an ideal flat-top passband', () => {
  it('gives the analytic line throughput, and the speed-equivalent f-number by its definition', () => {
    const curve = flatTop(HA + 1, 3);
    const st = studyCurve(curve, settings());
    const tau = st.onAxis.lines[0].throughput;
    expect(tau).toBeCloseTo(analyticTau(2, 2, HA + 1 - 1.5, HA + 1 + 1.5, 0.9), 3);
    // N_eq = N·sqrt(T_peak/τ) (docs/model.md §Throughput).
    expect(st.onAxis.lines[0].speedEquivalentFNumber).toBeCloseTo(2 * Math.sqrt(0.9 / tau), 9);
    // A collimated beam sees the measured passband itself.
    expect(st.onAxis.lines[0].collimated).toBeCloseTo(0.9, 9);
  });

  it('draws every chart from the same numbers the verdict states', () => {
    const st = studyCurve(flatTop(HA + 0.5, 3), settings({ optic: { id: null, name: 'x', fNumber: 2.4, obstruction: 0.36, fieldAngleDeg: 8, mapping: 'tangent' }, preShiftNm: 0.3 }));
    const tau = st.onAxis.lines[0].throughput;
    const at = (s: { x: number[]; y: number[] }, x: number) => s.y[s.x.findIndex((v) => Math.abs(v - x) < 1e-9)];
    expect(at(st.fSweep, 2.4)).toBeCloseTo(tau, 12);
    expect(st.fieldSweep.y[0]).toBeCloseTo(tau, 12);
    expect(st.fieldSweep.x[st.fieldSweep.x.length - 1]).toBe(8);
    expect(st.edge!.throughput).toBe(st.fieldSweep.y[st.fieldSweep.y.length - 1]);
    expect(at(st.shiftSweep, 0.3)).toBeCloseTo(tau, 12);
    expect(at(st.shiftSweep, st.onAxis.bestPreShift!.nm)).toBeCloseTo(st.onAxis.bestPreShift!.throughput, 12);
    // Nothing on the pre-shift chart beats the marked best.
    expect(Math.max(...st.shiftSweep.y)).toBeLessThanOrEqual(st.onAxis.bestPreShift!.throughput + 1e-12);
  });

  it('puts the curve on the bandwidth explorer where its ideal twin passes the same light', () => {
    const r = computeStudy([flatTop(HA + 1, 4)], settings());
    const m = r.explorer!.markers[0];
    expect(m.widthNm).toBeCloseTo(4, 2);
    expect(m.shiftNm).toBeCloseTo(1, 2);
    // The map's own cell for a 4 nm band at +1 nm: an ideal flat-top of peak 1, the curve has peak 0.9.
    const col = r.explorer!.widthsNm.indexOf(4);
    const row = r.explorer!.shiftsNm.reduce((best, v, i) => (Math.abs(v - 1) < Math.abs(r.explorer!.shiftsNm[best] - 1) ? i : best), 0);
    expect(Math.abs(r.explorer!.shiftsNm[row] - 1)).toBeLessThan(0.1);
    expect(r.explorer!.tau[row][col] * 0.9).toBeCloseTo(m.throughput, 1);
  });
});

describe('the verdict in words', () => {
  it('says how fast the optic behaves, where the best pre-shift is and what it gains', () => {
    const st = studyCurve(flatTop(HA, 3), settings({ nEff: null }));
    const v = verdictFor(st, settings().optic, 0);
    const speed = v.items.find((i) => i.key === 'speed')!;
    expect(speed.text).toMatch(/^This f\/2\.0 optic behaves like f\/\d+\.\d on this line/);
    const best = v.items.find((i) => i.key === 'best-shift')!;
    // The cone only moves a passband blueward, so the best pre-shift is toward the red.
    expect(st.onAxis.bestPreShift!.nm).toBeGreaterThan(0);
    expect(best.text).toMatch(/toward the red would raise Hα to \d+\.\d %, \d+\.\d points more\./);
    expect(v.items.find((i) => i.key === 'neff')!.text).toMatch(/1\.8–2\.3/);
  });

  it('names the [N II] neighbours of Hα with their leakage', () => {
    const st = studyCurve(flatTop(HA, 12), settings());
    const v = verdictFor(st, settings().optic, 0);
    const labels = v.items.filter((i) => i.key.startsWith('neighbour-')).map((i) => i.label);
    expect(labels).toEqual(['[N II] 654.80 nm', '[N II] 658.35 nm']);
    expect(v.items.find((i) => i.key === 'neighbour-NII-658')!.text).toMatch(/will not separate the two/);
  });

  it('says when nothing gets through', () => {
    const st = studyCurve(flatTop(HA - 10, 2), settings());
    const v = verdictFor(st, settings().optic, 0);
    expect(v.headline).toMatch(/nothing gets through/);
    expect(v.items.find((i) => i.key === 'speed')!.value).toBe('f/∞');
  });
});

describe('exports and requests', () => {
  it('writes every chart’s table into one CSV', () => {
    const s = settings({ optic: { id: null, name: 'Typed optic', fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 8, mapping: 'tangent' } });
    const csv = studyCsv(computeStudy([flatTop(HA + 1, 3)], s), s);
    for (const title of [
      '# verdict',
      '# angle of incidence reaching the filter',
      '# measured and cone-averaged curve',
      '# line throughput against f-number',
      '# line throughput across the field',
      '# line throughput against pre-shift',
      '# ideal flat-top passband',
      '# verdict in words',
    ]) {
      expect(csv).toContain(title);
    }
    const fRows = csv.split('# line throughput against f-number')[1].split('\r\n\r\n')[0].trim().split('\r\n');
    expect(fRows[1]).toBe('f_number,Ideal 3 nm (pasted)');
    expect(fRows.length - 2).toBe(46);
  });

  it('builds the API request a script would send for a catalogue curve', () => {
    const curve = { ...flatTop(HA, 3), id: 42, key: 'c42' };
    const body = coneRequestBody(curve, settings({ preShiftNm: 0.5, tempC: 5, tempCoeffNmPerC: 0.01, radialVelocityKms: -20, line: { nm: 656.3 } }), 8);
    expect(body).toEqual({
      curveId: 42,
      optic: { fNumber: 2, obstruction: 0, fieldAngleDeg: 8 },
      nEff: 2,
      preShiftNm: 0.5,
      tempC: 5,
      tempCoeffNmPerC: 0.01,
      refTempC: 20,
      lineNm: 656.3,
      radialVelocityKms: -20,
    });
  });
});

describe('operating against measurement temperature without a typed coefficient', () => {
  const opt = { id: null, name: 'Typed optic', fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 0, mapping: 'tangent' as const };
  it('a hard-coated curve measured at 20 °C, used at −10 °C, moves by the coating default 0.0035 nm/°C × −30 °C', () => {
    const c = { ...flatTop(HA, 3), tempC: 20, coating: 'hard' as const };
    const body = coneRequestBody(c, settings({ optic: opt, tempC: -10 }));
    expect(body.tempCoeffNmPerC).toBe(0.0035);
    expect(body.refTempC).toBe(20);
    const study = studyCurve(c, settings({ optic: opt, tempC: -10 }));
    expect(study.totalShiftNm).toBeCloseTo(0.0035 * -30, 12);
  });
  it('a fitted coefficient wins over the coating default; a typed one over both; unknown coating applies none', () => {
    const c = { ...flatTop(HA, 3), tempC: 20, coating: 'soft' as const, tempCoeffNmPerC: 0.011 };
    expect(coneRequestBody(c, settings({ optic: opt, tempC: 0 })).tempCoeffNmPerC).toBe(0.011);
    expect(coneRequestBody(c, settings({ optic: opt, tempC: 0, tempCoeffNmPerC: 0.002 })).tempCoeffNmPerC).toBe(0.002);
    expect(coneRequestBody({ ...flatTop(HA, 3), coating: 'unknown' }, settings({ optic: opt, tempC: 0 })).tempCoeffNmPerC).toBeUndefined();
  });
});

describe('error bars in the study', () => {
  it('a catalogue curve sends its wavelength uncertainty, gets a throughput range around the figure, and a straddle is found', async () => {
    const { straddledMarks } = await import('@/lib/study/error-bar');
    const c = { ...flatTop(HA - 1.2, 3), wavelengthUncertainty: { nm: 0.3, declared: false } };
    const s = settings({ optic: { id: null, name: 'Typed optic', fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 0, mapping: 'tangent' } });
    expect(coneRequestBody(c, s).wavelengthUncertaintyNm).toBe(0.3);
    const st = studyCurve(c, s);
    const [lo, hi] = st.onAxis.lines[0].throughputRange!;
    expect(lo).toBeLessThanOrEqual(st.onAxis.lines[0].throughput);
    expect(hi).toBeGreaterThanOrEqual(st.onAxis.lines[0].throughput);
    // the f-number chart's band holds the curve at every f-number and opens where the line sits on an edge
    const band = st.fSweepRange!;
    st.fSweep.y.forEach((v, i) => {
      expect(band.low[i]).toBeLessThanOrEqual(v);
      expect(band.high[i]).toBeGreaterThanOrEqual(v);
    });
    expect(Math.max(...band.high.map((h, i) => h - band.low[i]))).toBeGreaterThan(0.01);
    expect(straddledMarks([0.75, 0.85])).toEqual([0.8]);
    expect(straddledMarks([0.4, 0.9])).toEqual([0.8, 0.5]);
    expect(straddledMarks([0.81, 0.9])).toEqual([]);
  });
});

describe('the throughput the user needs against the error bar', () => {
  it('clears, falls short or straddles, and the link carries it as a percentage', async () => {
    const { needVerdict } = await import('@/lib/study/error-bar');
    const { parseStudyQuery, resolveSettings, studySearch } = await import('@/lib/study/url-state');
    expect(needVerdict([0.72, 0.78], 0.7).kind).toBe('clears');
    expect(needVerdict([0.72, 0.78], 0.8).kind).toBe('short');
    const st = needVerdict([0.78, 0.72], 0.75);
    expect(st.kind).toBe('straddles');
    expect(st.text).toContain('75 %');
    const q = parseStudyQuery(new URLSearchParams('curve=3&need=75'));
    expect(studySearch(q)).toBe('curve=3&need=75');
    expect(resolveSettings(q, [], { id: 'Ha' }).settings.neededThroughput).toBeCloseTo(0.75, 12);
    const bad = resolveSettings(parseStudyQuery(new URLSearchParams('need=150')), [], { id: 'Ha' });
    expect(bad.errors.need).toBe('Throughput you need must be between 1 and 100 %');
    expect(bad.settings.neededThroughput).toBeNull();
  });
});

describe('a polarised set in the study (docs/model.md §Polarised sets)', () => {
  it('sends the curve’s s and p indices unless an n_eff is typed, and the verdict shows both', () => {
    const c = { ...flatTop(HA, 3), nEff: 1.9, nEffPolarised: { s: 1.95, p: 1.85 } };
    const fitted = settings({ nEff: null });
    expect(coneRequestBody(c, fitted).nEffPolarised).toEqual({ s: 1.95, p: 1.85 });
    expect(coneRequestBody(c, settings({ nEff: 2 })).nEffPolarised).toBeUndefined();
    const st = studyCurve(c, fitted);
    expect(st.nEffPolarised).toEqual({ s: 1.95, p: 1.85 });
    const neff = verdictFor(st, fitted.optic, 0).items.find((i) => i.key === 'neff')!;
    expect(neff.value).toBe('s 1.95 · p 1.85');
    // the cone is the mean of the two halves, so it sits between the single-index answers
    const s = studyCurve({ ...c, nEffPolarised: null, nEff: 1.95 }, fitted).onAxis.lines[0].throughput;
    const p = studyCurve({ ...c, nEffPolarised: null, nEff: 1.85 }, fitted).onAxis.lines[0].throughput;
    expect(st.onAxis.lines[0].throughput).toBeCloseTo(0.5 * (s + p), 9);
  });
});

describe('the fitted n_eff’s own uncertainty in the error bars', () => {
  it('a curve of a set of three or more angles sends its standard error, which widens the range', () => {
    // CWLs of n_eff 1.9 with a few hundredths of a nm of scatter (closed form of docs/model.md §Angle shift)
    const wobble = [0.03, -0.02, 0.025, -0.03, 0.01];
    const set = [0, 4, 8, 12, 16].map((a, i) => ({ curveId: i + 1, aoiDeg: a, cwlNm: HA * Math.sqrt(1 - Math.sin((a * Math.PI) / 180) ** 2 / 1.9 ** 2) + wobble[i] }));
    const c = { ...flatTop(HA - 1.2, 3), nEff: 1.9, set, wavelengthUncertainty: { nm: 0.05, declared: true } };
    const s = settings({ nEff: null });
    const body = coneRequestBody(c, s);
    expect(body.nEffUncertainty as number).toBeGreaterThan(0.001);
    expect(body.nEffUncertainty as number).toBeLessThan(0.1);
    // a typed n_eff carries no fitted uncertainty; nor does a two-angle set
    expect(coneRequestBody(c, settings({ nEff: 1.9 })).nEffUncertainty).toBeUndefined();
    expect(coneRequestBody({ ...c, set: set.slice(0, 2) }, s).nEffUncertainty).toBeUndefined();
    const withSn = studyCurve(c, s).onAxis.lines[0].throughputRange!;
    const without = studyCurve({ ...c, set: null }, s).onAxis.lines[0].throughputRange!;
    expect(withSn[1] - withSn[0]).toBeGreaterThanOrEqual(without[1] - without[0]);
  });
});
