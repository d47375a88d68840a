import { describe, expect, it } from 'vitest';
import { runConeModel } from '@/lib/engine/cone-study';
import { SPEED_OF_LIGHT_KMS } from '@/lib/engine/lines';
import { DOUBLETS, GALAXY_PRESETS, weightedLines } from '@/lib/engine/target';
import { flatTop } from './fixtures';

const optic = { fNumber: 2.5, obstruction: 0.36 };

describe('target: redshift, doublets and weighted totals', () => {
  it('z moves a line to λ₀(1 + z) and equals v = cz (closed form)', () => {
    const pts = flatTop(657.5, 6, 0.3, 0.9, 0.02, 25);
    const z = 0.001544; // M51, NED (from memory)
    const a = runConeModel({ points: pts, optic, nEff: 2, lines: ['Ha'], z });
    expect(a.lines[0].wavelengthNm).toBeCloseTo(656.28 * (1 + z), 10);
    const b = runConeModel({ points: pts, optic, nEff: 2, lines: ['Ha'], radialVelocityKms: z * SPEED_OF_LIGHT_KMS });
    expect(a.lines[0].throughput).toBeCloseTo(b.lines[0].throughput, 12);
    expect(a.target!.z).toBe(z);
  });

  it('refuses z together with radialVelocityKms, naming z', () => {
    const pts = flatTop(657.5, 6, 0.3);
    try {
      runConeModel({ points: pts, optic, nEff: 2, z: 0.001, radialVelocityKms: 100 });
      throw new Error('accepted');
    } catch (e) {
      expect((e as { status: number }).status).toBe(422);
      expect((e as { details: { field: string }[] }).details.map((d) => d.field)).toContain('z');
    }
  });

  it('refuses a weight for an unknown line, naming it', () => {
    const pts = flatTop(657.5, 6, 0.3);
    try {
      runConeModel({ points: pts, optic, nEff: 2, lines: ['Ha'], lineWeights: { Hz: 2 } });
      throw new Error('accepted');
    } catch (e) {
      expect((e as { details: { field: string }[] }).details.map((d) => d.field)).toContain('lineWeights.Hz');
    }
  });

  it('doublet ratios are the Storey & Zeippen (2000, MNRAS 312, 813) values, from memory', () => {
    expect(DOUBLETS.find((d) => d.primary === 'OIII')!.ratio).toBeCloseTo(2.98, 2);
    expect(DOUBLETS.find((d) => d.primary === 'NII-658')!.ratio).toBeCloseTo(2.94, 2);
    expect(weightedLines(['OIII'], {}, true)).toEqual([
      { id: 'OIII', weight: 1, fromDoublet: false },
      { id: 'OIII-496', weight: 1 / 2.98, fromDoublet: true },
    ]);
  });

  it('a filter passing only [O III] 500.7 keeps 2.98/3.98 of the doublet (closed form)', () => {
    // flat top 3 nm wide at 501.5 nm: 500.7 inside through the cone, 495.9 far outside
    const pts = flatTop(501.2, 3, 0.05, 1, 0.01, 20);
    const r = runConeModel({ points: pts, optic, nEff: 2, lines: ['OIII'], doublets: true });
    const t5007 = r.target!.lines.find((l) => l.id === 'OIII')!.throughput;
    const t4959 = r.target!.lines.find((l) => l.id === 'OIII-496')!.throughput;
    expect(t4959).toBeLessThan(1e-9);
    expect(r.target!.total).toBeCloseTo((t5007 * 2.98) / 3.98, 10);
  });

  it('a dual-band curve reports each line and the weighted total Σwτ/Σw', () => {
    // two flat tops: one at Hα, one at [O III]; the Hα band half as transmissive
    const wl: number[] = [];
    const tr: number[] = [];
    for (let x = 480; x <= 680; x += 0.02) {
      wl.push(x);
      tr.push(Math.abs(x - 501.3) < 3 ? 0.9 : Math.abs(x - 657) < 3 ? 0.45 : 0);
    }
    const r = runConeModel({ points: { wavelengthNm: wl, transmission: tr }, optic, nEff: 2, lines: ['Ha', 'OIII'], lineWeights: { Ha: 3, OIII: 1 } });
    const [ha, o3] = r.target!.lines;
    expect(ha.weight).toBe(3);
    expect(r.target!.total).toBeCloseTo((3 * ha.throughput + o3.throughput) / 4, 12);
    expect(ha.throughput).toBeCloseTo(0.45, 2);
    expect(o3.throughput).toBeCloseTo(0.9, 2);
  });

  it('galaxy presets hold small redshifts from NED (from memory)', () => {
    const m31 = GALAXY_PRESETS.find((g) => g.id === 'M31')!;
    expect(m31.z * SPEED_OF_LIGHT_KMS).toBeCloseTo(-300, -1);
    for (const g of GALAXY_PRESETS) expect(Math.abs(g.z)).toBeLessThan(0.01);
  });
});
