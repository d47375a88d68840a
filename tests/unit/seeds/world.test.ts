import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { defaultTempCoeff, fitTempCoeff } from '@/lib/engine/temperature';
import { fitPolarisedIndices } from '@/lib/engine/neff';
import {
  DEMO_NOTICE,
  LINE_AIR_NM,
  angleScale,
  applyAngle,
  buildDemoWorld,
  multiCavityPassband,
  type CurvePoints,
  type DemoCurve,
  type DemoWorld,
} from '@/seeds/world';

// ---------------------------------------------------------------- helpers (independent of the generator)
interface HalfMax {
  peakT: number;
  leftNm: number;
  rightNm: number;
  cwlNm: number;
  fwhmNm: number;
}

/** Walk out from the global maximum to the first T_peak/2 crossing on each side (linear interpolation). */
function halfMax(points: CurvePoints): HalfMax {
  const { wavelengthNm: w, transmission: t } = points;
  let iMax = 0;
  for (let i = 1; i < t.length; i++) if (t[i] > t[iMax]) iMax = i;
  const peakT = t[iMax];
  const half = peakT / 2;
  let i = iMax;
  while (i > 0 && t[i - 1] >= half) i--;
  if (i === 0) throw new Error('no left crossing');
  const leftNm = w[i - 1] + ((half - t[i - 1]) / (t[i] - t[i - 1])) * (w[i] - w[i - 1]);
  let j = iMax;
  while (j < t.length - 1 && t[j + 1] >= half) j++;
  if (j === t.length - 1) throw new Error('no right crossing');
  const rightNm = w[j] + ((t[j] - half) / (t[j] - t[j + 1])) * (w[j + 1] - w[j]);
  return { peakT, leftNm, rightNm, cwlNm: (leftNm + rightNm) / 2, fwhmNm: rightNm - leftNm };
}

/** docs/model.md §Effective index: least squares λ² = a + b·sin²θ, n_eff = sqrt(−a/b), λ0 = sqrt(a). */
function fitEffectiveIndex(measurements: { aoiDeg: number; cwlNm: number }[]) {
  const xs = measurements.map((m) => Math.sin((m.aoiDeg * Math.PI) / 180) ** 2);
  const ys = measurements.map((m) => m.cwlNm ** 2);
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
  }
  const b = sxy / sxx;
  const a = my - b * mx;
  return { nEff: Math.sqrt(-a / b), cwl0Nm: Math.sqrt(a), b };
}

const world: DemoWorld = buildDemoWorld();
const verified = world.curves.filter((c) => c.status === 'verified');
const byKey = new Map(world.curves.map((c) => [c.key, c]));

function decimals(x: number): number {
  const s = String(x);
  const dot = s.indexOf('.');
  return dot < 0 || s.includes('e') ? 0 : s.length - dot - 1;
}

// ---------------------------------------------------------------- determinism & speed
describe('buildDemoWorld', () => {
  it('is deterministic for a seed', () => {
    expect(buildDemoWorld()).toEqual(world);
    expect(buildDemoWorld(20261202)).toEqual(world);
  });

  it('changes the samples, not the structure, with another seed', () => {
    const other = buildDemoWorld(7);
    expect(other.curves.map((c) => c.key)).toEqual(world.curves.map((c) => c.key));
    expect(other.curves[0].points.transmission).not.toEqual(world.curves[0].points.transmission);
    expect(other.people).toEqual(world.people);
    expect(other.optics).toEqual(world.optics);
  });

  it('builds well under 2 s', () => {
    const t0 = performance.now();
    buildDemoWorld(99);
    expect(performance.now() - t0).toBeLessThan(1500);
  });

  it('is marked as invented', () => {
    expect(DEMO_NOTICE).toBe('Demo data: invented makers, places, people and generated curves.');
    expect(world.notice).toBe(DEMO_NOTICE);
    for (const lab of world.labs) expect(lab.name).toContain('(demo)');
    for (const c of world.curves) {
      expect(c.notes).toContain('(demo)');
      expect(c.method.lab).toContain('(demo)');
    }
  });
});

// ---------------------------------------------------------------- people, makers, labs, optics
describe('people, makers, labs and optics', () => {
  it('has the required accounts with their roles', () => {
    const roleOf = new Map(world.people.map((p) => [p.email, p.role]));
    expect(roleOf.get('contributor@bandcone.test')).toBe('contributor');
    expect(roleOf.get('contributor2@bandcone.test')).toBe('contributor');
    expect(roleOf.get('moderator@bandcone.test')).toBe('moderator');
    expect(roleOf.get('moderator2@bandcone.test')).toBe('moderator');
    expect(roleOf.get('admin@bandcone.test')).toBe('admin');
    const extra = world.people.filter((p) => p.role === 'contributor' && !/^contributor2?@/.test(p.email));
    expect(extra.length).toBeGreaterThanOrEqual(4);
    expect(extra.length).toBeLessThanOrEqual(6);
  });

  it('keeps every demo email inside bandcone.test, unique', () => {
    const emails = world.people.map((p) => p.email);
    expect(new Set(emails).size).toBe(emails.length);
    for (const e of emails) expect(e).toMatch(/^[a-z0-9.+-]+@bandcone\.test$/);
    const known = new Set(emails);
    for (const c of world.curves) expect(known.has(c.contributorEmail)).toBe(true);
    for (const r of world.reviews) expect(known.has(r.moderatorEmail)).toBe(true);
  });

  it('has 6–8 makers and 5–7 labs, each curve pointing at one of them', () => {
    expect(world.makers.length).toBeGreaterThanOrEqual(6);
    expect(world.makers.length).toBeLessThanOrEqual(8);
    expect(world.labs.length).toBeGreaterThanOrEqual(5);
    expect(world.labs.length).toBeLessThanOrEqual(7);
    const makers = new Set(world.makers.map((m) => m.name));
    const labs = new Set(world.labs.map((l) => l.name));
    for (const c of world.curves) {
      expect(makers.has(c.makerName)).toBe(true);
      expect(c.label.startsWith(c.makerName.split(' ')[0])).toBe(true);
      expect(labs.has(c.method.lab)).toBe(true);
    }
  });

  it('has 6–8 optics with derived f-number and obstruction', () => {
    expect(world.optics.length).toBeGreaterThanOrEqual(6);
    expect(world.optics.length).toBeLessThanOrEqual(8);
    for (const o of world.optics) {
      expect(o.fNumber).toBeCloseTo(o.focalLengthMm / o.apertureMm, 3);
      expect(o.obstruction).toBeCloseTo(o.obstructionMm / o.apertureMm, 3);
      expect(o.obstruction).toBeGreaterThanOrEqual(0);
      expect(o.obstruction).toBeLessThan(1);
      expect(o.fNumber).toBeGreaterThanOrEqual(0.5);
    }
    const fast = world.optics.find((o) => o.name === 'Obstructed astrograph f/2.5');
    expect(fast).toMatchObject({ fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 6 });
    // The corrector-plate system with the camera at focus: 432/240 = f/1.8, 100.8/240 = 0.42 (by hand).
    const corrector = world.optics.find((o) => o.name.startsWith('Corrector-plate system'));
    expect(corrector).toMatchObject({ apertureMm: 240, fNumber: 1.8, obstruction: 0.42 });
  });
});

// ---------------------------------------------------------------- curves
describe('curves', () => {
  it('has enough verified curves and a small review queue', () => {
    expect(verified.length).toBeGreaterThanOrEqual(90);
    const submitted = world.curves.filter((c) => c.status === 'submitted');
    const sentBack = world.curves.filter((c) => c.status === 'changes_requested');
    expect(submitted.length).toBeGreaterThanOrEqual(4);
    expect(submitted.length).toBeLessThanOrEqual(6);
    expect(sentBack.length).toBeGreaterThanOrEqual(1);
    expect(sentBack.length).toBeLessThanOrEqual(2);
  });

  it('has unique stable keys', () => {
    const keys = world.curves.map((c) => c.key);
    expect(new Set(keys).size).toBe(keys.length);
    for (const k of keys) expect(k).toMatch(/^[a-z0-9-]+$/);
  });

  it('covers every required line family, dual bands and wide passbands', () => {
    const has = (pred: (c: DemoCurve) => boolean) => verified.filter(pred).length;
    expect(has((c) => c.lines.includes('Ha'))).toBeGreaterThan(5);
    expect(has((c) => c.lines.includes('OIII'))).toBeGreaterThan(5);
    expect(has((c) => c.lines.includes('SII-671') && c.lines.includes('SII-673'))).toBeGreaterThan(3);
    expect(has((c) => c.lines.includes('Hb'))).toBeGreaterThan(3);
    expect(has((c) => c.lines.includes('Ha') && c.lines.includes('OIII') && c.generated.bands.length === 2)).toBeGreaterThan(2);
    expect(has((c) => c.nominalFwhmNm >= 10)).toBeGreaterThan(2);
    const validIds = new Set(Object.keys(LINE_AIR_NM));
    for (const c of world.curves) for (const l of c.lines) expect(validIds.has(l)).toBe(true);
  });

  it('uses bandwidths of 2.5–12 nm and peaks of 0.80–0.97', () => {
    for (const c of world.curves) {
      expect(c.nominalFwhmNm).toBeGreaterThanOrEqual(2.5);
      expect(c.nominalFwhmNm).toBeLessThanOrEqual(12);
      for (const b of c.generated.bands) {
        expect(b.peakT).toBeGreaterThanOrEqual(0.8);
        expect(b.peakT).toBeLessThanOrEqual(0.97);
        expect(b.cavities).toBeGreaterThanOrEqual(2);
        expect(b.cavities).toBeLessThanOrEqual(4);
      }
    }
  });

  it('declares pre-shifts of 0.3–1.5 nm on some models, with the nominal CWL shifted red of the line', () => {
    const shifted = world.curves.filter((c) => c.declaredPreShiftNm !== undefined);
    expect(new Set(shifted.map((c) => c.label)).size).toBeGreaterThanOrEqual(4);
    for (const c of shifted) {
      expect(c.declaredPreShiftNm!).toBeGreaterThanOrEqual(0.3);
      expect(c.declaredPreShiftNm!).toBeLessThanOrEqual(1.5);
      // the unshifted design centre lies among the target lines of the primary passband
      const design = c.nominalCwlNm - c.declaredPreShiftNm!;
      const near = c.lines.map((l) => LINE_AIR_NM[l]).filter((nm) => Math.abs(nm - c.nominalCwlNm) < c.nominalFwhmNm);
      expect(near.length).toBeGreaterThan(0);
      expect(design).toBeGreaterThanOrEqual(Math.min(...near) - 0.1);
      expect(design).toBeLessThanOrEqual(Math.max(...near) + 0.1);
    }
  });

  it('has valid sample arrays: finite, 0 ≤ T ≤ 1, strictly increasing, 300–2000 points, 5 decimals', () => {
    for (const c of world.curves) {
      const { wavelengthNm: w, transmission: t } = c.points;
      expect(w.length).toBe(t.length);
      expect(w.length).toBeGreaterThanOrEqual(300);
      expect(w.length).toBeLessThanOrEqual(2000);
      const bad: string[] = [];
      for (let i = 0; i < w.length; i++) {
        if (!Number.isFinite(w[i]) || !Number.isFinite(t[i])) bad.push(`${i}: not finite`);
        if (!(t[i] >= 0 && t[i] <= 1) || Object.is(t[i], -0)) bad.push(`${i}: T = ${t[i]}`);
        if (decimals(t[i]) > 5) bad.push(`${i}: more than 5 decimals`);
        if (i > 0 && !(w[i] > w[i - 1])) bad.push(`${i}: wavelength not increasing`);
      }
      expect(bad, c.key).toEqual([]);
      const step = c.generated.stepNm;
      expect(step).toBeGreaterThanOrEqual(0.05);
      expect(step).toBeLessThanOrEqual(0.5);
      expect(w[1] - w[0]).toBeCloseTo(step, 6);
    }
  });

  it('samples at least λc ± 6·FWHM around every passband', () => {
    for (const c of world.curves) {
      const w = c.points.wavelengthNm;
      for (const b of c.generated.bandsAtAoi) {
        expect(w[0]).toBeLessThanOrEqual(b.cwlNm - 6 * b.fwhmNm);
        expect(w[w.length - 1]).toBeGreaterThanOrEqual(b.cwlNm + 6 * b.fwhmNm);
      }
    }
    expect(world.curves.filter((c) => c.points.wavelengthNm[0] === 400 && c.points.wavelengthNm.at(-1) === 800).length).toBeGreaterThanOrEqual(3);
  });

  it('gives every curve a half-max FWHM within 5 % of the intended one, centred on the primary passband', () => {
    for (const c of world.curves) {
      const hm = halfMax(c.points);
      const intended = c.generated.bandsAtAoi[0];
      expect(Math.abs(hm.cwlNm - intended.cwlNm), c.key).toBeLessThan(0.1);
      expect(Math.abs(hm.fwhmNm / intended.fwhmNm - 1), c.key).toBeLessThan(0.05);
      expect(Math.abs(hm.peakT - intended.peakT), c.key).toBeLessThan(0.04);
    }
  });

  it('keeps the measured unit near the catalogue, except the deliberately off ones', () => {
    const flat = world.curves.filter((c) => c.method.aoiDeg === 0);
    const off = flat.filter((c) => c.generated.anomaly);
    expect(off.filter((c) => c.status === 'verified').length).toBeGreaterThanOrEqual(1);
    for (const c of flat) {
      const d = Math.abs(halfMax(c.points).cwlNm - c.nominalCwlNm);
      if (c.generated.anomaly) expect(d, c.key).toBeGreaterThan(0.5);
      else expect(d, c.key).toBeLessThan(0.5);
    }
  });

  it('has labels shared by 3–6 units, with unit spread of at most ±0.3 nm CWL and ±5 % FWHM', () => {
    const byLabel = new Map<string, DemoCurve[]>();
    for (const c of world.curves) {
      if (c.method.aoiDeg !== 0) continue;
      byLabel.set(c.label, [...(byLabel.get(c.label) ?? []), c]);
    }
    const shared = [...byLabel.values()].filter((units) => new Set(units.map((u) => u.serial)).size >= 3);
    expect(shared.length).toBeGreaterThanOrEqual(5);
    for (const units of byLabel.values()) {
      expect(new Set(units.map((u) => u.serial)).size).toBeLessThanOrEqual(6);
      const normal = units.filter((u) => !u.generated.anomaly).map((u) => u.generated.bands[0]);
      const cwls = normal.map((b) => b.cwlNm);
      const fwhms = normal.map((b) => b.fwhmNm);
      expect(Math.max(...cwls) - Math.min(...cwls)).toBeLessThanOrEqual(0.6);
      expect(Math.max(...fwhms) / Math.min(...fwhms)).toBeLessThanOrEqual(1.1 / 0.95);
    }
  });

  it('has complete, plausible method metadata', () => {
    for (const c of world.curves) {
      expect(['spectrophotometer', 'spectrograph', 'monochromator', 'other']).toContain(c.method.instrument);
      expect(['collimated', 'converging']).toContain(c.method.beam);
      if (c.method.beam === 'converging') expect(c.method.beamFNumber).toBeGreaterThan(1);
      expect(c.method.resolutionNm).toBeGreaterThan(0);
      expect(c.method.measuredOn).toMatch(/^202[4-6]-\d\d-\d\d$/);
      expect(Number.isNaN(Date.parse(c.method.measuredOn))).toBe(false);
      expect(['CC-BY-4.0', 'CC0-1.0']).toContain(c.licence);
      expect(c.serial.length).toBeGreaterThan(3);
      expect(c.sizeMm).toBeGreaterThan(0);
    }
  });
});

// ---------------------------------------------------------------- multi-angle sets
describe('multi-angle curve sets', () => {
  it('has at least 5 sets measured at 0, 4, 8, 12, 16° on one unit', () => {
    expect(world.sets.length).toBeGreaterThanOrEqual(5);
    for (const set of world.sets) {
      expect(set.aoisDeg).toEqual([0, 4, 8, 12, 16]);
      expect(set.trueNEff).toBeGreaterThanOrEqual(1.7);
      expect(set.trueNEff).toBeLessThanOrEqual(2.1);
      const curves = set.curveKeys.map((k) => byKey.get(k)!);
      for (const [i, c] of curves.entries()) {
        expect(c.setKey).toBe(set.key);
        expect(c.trueNEff).toBe(set.trueNEff);
        expect(c.serial).toBe(set.serial);
        expect(c.method.aoiDeg).toBe(set.aoisDeg[i]);
        expect(c.method.beam).toBe('collimated');
        expect(c.status).toBe('verified');
      }
    }
  });

  it('moves the CWL as λ0·s(θ) with the true effective index, and the fit recovers it', () => {
    for (const set of world.sets) {
      const measurements = set.curveKeys.map((k) => {
        const c = byKey.get(k)!;
        const expected = set.cwl0Nm * angleScale(c.method.aoiDeg, set.trueNEff);
        const cwlNm = halfMax(c.points).cwlNm;
        expect(Math.abs(cwlNm - expected), k).toBeLessThan(0.1);
        return { aoiDeg: c.method.aoiDeg, cwlNm };
      });
      const fit = fitEffectiveIndex(measurements);
      expect(fit.b).toBeLessThan(0);
      expect(Math.abs(fit.nEff - set.trueNEff), set.key).toBeLessThan(0.05);
      expect(Math.abs(fit.cwl0Nm - set.cwl0Nm)).toBeLessThan(0.1);
    }
  });
});

// ---------------------------------------------------------------- reviews
describe('reviews', () => {
  it('gives every verified curve one public moderator note dated after the measurement', () => {
    const reviewsByKey = new Map(world.reviews.map((r) => [r.curveKey, r]));
    expect(reviewsByKey.size).toBe(world.reviews.length);
    for (const c of world.curves) {
      const r = reviewsByKey.get(c.key);
      if (c.status === 'submitted') {
        expect(r).toBeUndefined();
        continue;
      }
      expect(r, c.key).toBeDefined();
      expect(['moderator@bandcone.test', 'moderator2@bandcone.test']).toContain(r!.moderatorEmail);
      expect(r!.moderatorEmail).not.toBe(c.contributorEmail);
      expect(r!.decision).toBe(c.status === 'verified' ? 'verify' : 'request_changes');
      expect(r!.note.length).toBeGreaterThan(10);
      expect(r!.reviewedOn > c.method.measuredOn).toBe(true);
      expect(r!.reviewedOn <= '2026-12-01').toBe(true);
    }
  });
});

// ---------------------------------------------------------------- shape helpers
describe('multiCavityPassband', () => {
  const band = fc.record({
    cwlNm: fc.double({ min: 380, max: 720, noNaN: true }),
    fwhmNm: fc.double({ min: 1, max: 15, noNaN: true }),
    peakT: fc.double({ min: 0.5, max: 1, noNaN: true }),
    cavities: fc.integer({ min: 1, max: 5 }),
  });

  it('is exactly half the peak at λc ± FWHM/2, peaks at λc and is symmetric', () => {
    fc.assert(
      fc.property(band, fc.double({ min: 0, max: 3, noNaN: true }), (b, x) => {
        const f = multiCavityPassband({ bands: [b] });
        expect(f(b.cwlNm)).toBeCloseTo(b.peakT, 12);
        expect(f(b.cwlNm - b.fwhmNm / 2)).toBeCloseTo(b.peakT / 2, 9);
        expect(f(b.cwlNm + b.fwhmNm / 2)).toBeCloseTo(b.peakT / 2, 9);
        const d = (x * b.fwhmNm) / 2;
        expect(f(b.cwlNm + d)).toBeCloseTo(f(b.cwlNm - d), 9);
        expect(f(b.cwlNm + d)).toBeLessThanOrEqual(b.peakT + 1e-12);
      }),
    );
  });

  it('gets steeper with more cavities and keeps the blocking floor far out', () => {
    const base = { cwlNm: 656.3, fwhmNm: 5, peakT: 0.9 };
    const two = multiCavityPassband({ bands: [{ ...base, cavities: 2 }], blockingFloor: 5e-4 });
    const four = multiCavityPassband({ bands: [{ ...base, cavities: 4 }], blockingFloor: 5e-4 });
    expect(four(656.3 + 4)).toBeLessThan(two(656.3 + 4));
    expect(four(656.3 + 1.5)).toBeGreaterThan(two(656.3 + 1.5));
    expect(two(500)).toBeGreaterThanOrEqual(5e-4);
    expect(two(500)).toBeLessThan(6e-4);
  });

  it('rejects impossible bands', () => {
    expect(() => multiCavityPassband({ bands: [{ cwlNm: 500, fwhmNm: 0, peakT: 0.9, cavities: 2 }] })).toThrow();
    expect(() => multiCavityPassband({ bands: [{ cwlNm: 500, fwhmNm: 3, peakT: 1.2, cavities: 2 }] })).toThrow();
  });
});

describe('applyAngle', () => {
  it('implements T_θ(λ) = T_0(λ / s(θ)) exactly and keeps wavelengths increasing', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 30, noNaN: true }),
        fc.double({ min: 1, max: 4, noNaN: true }),
        (aoi, nEff) => {
          const t0 = multiCavityPassband({ bands: [{ cwlNm: 600, fwhmNm: 6, peakT: 0.9, cavities: 3 }] });
          const w = Array.from({ length: 50 }, (_, i) => 570 + i * 1.2);
          const out = applyAngle({ wavelengthNm: w, transmission: w.map(t0) }, aoi, nEff);
          const s = Math.sqrt(1 - Math.sin((aoi * Math.PI) / 180) ** 2 / nEff ** 2);
          expect(s).toBeCloseTo(angleScale(aoi, nEff), 12);
          for (let i = 0; i < w.length; i++) {
            expect(out.transmission[i]).toBeCloseTo(t0(out.wavelengthNm[i] / s), 9);
            if (i > 0) expect(out.wavelengthNm[i]).toBeGreaterThan(out.wavelengthNm[i - 1]);
          }
        },
      ),
    );
  });

  it('is the identity at normal incidence and moves blueward with angle', () => {
    const pts = { wavelengthNm: [650, 656, 662], transmission: [0.1, 0.9, 0.1] };
    expect(applyAngle(pts, 0, 2)).toEqual(pts);
    const tilted = applyAngle(pts, 10, 2);
    expect(tilted.wavelengthNm[1]).toBeLessThan(656);
    expect(tilted.transmission).toEqual(pts.transmission);
  });

  it('rejects an effective index outside 1.0–4.0', () => {
    const pts = { wavelengthNm: [1, 2], transmission: [0, 1] };
    expect(() => applyAngle(pts, 5, 0.9)).toThrow();
    expect(() => applyAngle(pts, 5, 4.5)).toThrow();
  });
});

describe('other seeds', () => {
  it('keep every invariant that the checks rely on', () => {
    for (const seed of [1, 42, 31337]) {
      const w = buildDemoWorld(seed);
      for (const c of w.curves) {
        const hm = halfMax(c.points);
        expect(Math.abs(hm.fwhmNm / c.generated.bandsAtAoi[0].fwhmNm - 1), `${seed} ${c.key}`).toBeLessThan(0.05);
        expect(c.points.transmission.every((t) => t >= 0 && t <= 1)).toBe(true);
      }
      for (const set of w.sets) {
        const fit = fitEffectiveIndex(set.curveKeys.map((k) => {
          const c = w.curves.find((x) => x.key === k)!;
          return { aoiDeg: c.method.aoiDeg, cwlNm: halfMax(c.points).cwlNm };
        }));
        expect(Math.abs(fit.nEff - set.trueNEff)).toBeLessThan(0.05);
      }
    }
  });
});

describe('set reviews', () => {
  it('review a whole curve set at once, after its last measurement', () => {
    for (const set of world.sets) {
      const rs = world.reviews.filter((r) => set.curveKeys.includes(r.curveKey));
      expect(rs.length).toBe(set.curveKeys.length);
      expect(new Set(rs.map((r) => `${r.moderatorEmail} ${r.reviewedOn}`)).size).toBe(1);
      const last = set.curveKeys.map((k) => byKey.get(k)!.method.measuredOn).sort().at(-1)!;
      expect(rs[0].reviewedOn > last).toBe(true);
    }
  });
});

// ---------------------------------------------------------------- coatings, temperature and polarised sets
describe('coatings, a multi-temperature set and a polarised set', () => {
  it('declares a coating on every curve: mostly hard, a few soft, some unknown', () => {
    const count = { hard: 0, soft: 0, unknown: 0 };
    for (const c of world.curves) count[c.method.coating!]++;
    expect(count.hard).toBeGreaterThan(count.soft + count.unknown);
    expect(count.soft).toBeGreaterThan(0);
    expect(count.unknown).toBeGreaterThan(0);
  });

  it('moves a temperature set by its true dCWL/dT, and the least-squares fit recovers it (temperature.ts)', () => {
    const tsets = new Map<string, DemoCurve[]>();
    for (const c of world.curves) if (c.trueTempCoeffNmPerC !== undefined) tsets.set(c.setKey!, [...(tsets.get(c.setKey!) ?? []), c]);
    expect(tsets.size).toBeGreaterThanOrEqual(2);
    const coatings = new Set<string>();
    for (const [key, curves] of tsets) {
      expect(new Set(curves.map((c) => c.method.temperatureC)).size).toBe(curves.length);
      expect(curves.every((c) => c.method.aoiDeg === 0)).toBe(true);
      const fit = fitTempCoeff(curves.map((c) => ({ tempC: c.method.temperatureC!, cwlNm: halfMax(c.points).cwlNm })));
      const truth = curves[0].trueTempCoeffNmPerC!;
      // within 15 % of the truth, and inside the coating's published range (lib/engine/temperature.ts)
      expect(Math.abs(fit.nmPerC - truth) / truth, key).toBeLessThan(0.15);
      const d = defaultTempCoeff(curves[0].method.coating)!;
      expect(fit.nmPerC).toBeGreaterThanOrEqual(d.range[0]);
      expect(fit.nmPerC).toBeLessThanOrEqual(d.range[1]);
      coatings.add(curves[0].method.coating!);
    }
    expect([...coatings].sort()).toEqual(['hard', 'soft']);
  });

  it('splits a polarised set into s and p curves whose separate fits recover the true indices (neff.ts)', () => {
    const psets = new Map<string, DemoCurve[]>();
    for (const c of world.curves) if (c.trueNEffPolarised) psets.set(c.setKey!, [...(psets.get(c.setKey!) ?? []), c]);
    expect(psets.size).toBeGreaterThanOrEqual(1);
    for (const curves of psets.values()) {
      expect(curves.map((c) => c.method.polarization).sort()).toEqual(['p', 'p', 's', 's', 'unpolarized']);
      const fit = fitPolarisedIndices(curves.map((c) => ({ aoiDeg: c.method.aoiDeg, cwlNm: halfMax(c.points).cwlNm, polarization: c.method.polarization })))!;
      const truth = curves[0].trueNEffPolarised!;
      expect(Math.abs(fit.s.nEff - truth.s)).toBeLessThan(0.03);
      expect(Math.abs(fit.p.nEff - truth.p)).toBeLessThan(0.03);
      expect(fit.p.nEff).toBeLessThan(fit.s.nEff);
    }
  });
});
