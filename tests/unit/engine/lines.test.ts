import { describe, expect, it } from 'vitest';
import {
  EXTRA_LINES,
  LINES,
  airToVacuum,
  dopplerShift,
  getLine,
  lineColor,
  neighboursOf,
  vacuumToAir,
} from '@/lib/engine/lines';
import { EngineInputError } from '@/lib/engine/errors';

describe('air ↔ vacuum (IAU standard, Morton 2000, ApJS 130, 403)', () => {
  it('reproduces the worked value: Hα 656.461 nm vacuum → 656.280 nm air', () => {
    // Source: Morton 2000 formula; worked value quoted in docs/model.md §Lines.
    expect(vacuumToAir(656.461)).toBeCloseTo(656.28, 3);
  });

  // Vacuum wavelengths recalled from the NIST Atomic Spectra Database (from memory),
  // paired with the catalogue's air value; each must agree through the formula.
  const nistVacuum: [string, number, number][] = [
    ['Ha', 656.461, 0.01],
    ['Hb', 486.271, 0.01],
    ['Hg', 434.169, 0.01],
    ['OIII', 500.824, 0.01],
    ['OIII-496', 496.029, 0.01],
    ['NII-658', 658.527, 0.01],
    ['NII-655', 654.986, 0.01],
    ['SII-671', 671.829, 0.01],
    ['SII-673', 673.267, 0.01],
    ['HeII', 468.702, 0.02], // approximate, from memory
    ['OI', 630.204, 0.01],
    ['ArIII', 713.79, 0.02],
    ['OII', 372.709, 0.01],
    ['OII-3729', 372.988, 0.01],
  ];
  for (const [id, vac, tol] of nistVacuum) {
    it(`${id}: catalogue air value matches NIST vacuum ${vac} nm within ${tol} nm`, () => {
      const line = getLine(id);
      expect(Math.abs(line.vacuumNm - vac)).toBeLessThan(tol);
      expect(Math.abs(vacuumToAir(vac) - line.airNm)).toBeLessThan(tol);
    });
  }

  it('round-trips vacuum → air → vacuum to 1e-6 nm across 300–1100 nm', () => {
    for (let v = 300; v <= 1100; v += 7.3) {
      expect(Math.abs(airToVacuum(vacuumToAir(v)) - v)).toBeLessThan(1e-6);
    }
  });

  it('air is shorter than vacuum by about 0.028 % in the visible (refractivity of air, common knowledge)', () => {
    const v = 550;
    const rel = (v - vacuumToAir(v)) / v;
    expect(rel).toBeGreaterThan(2.7e-4);
    expect(rel).toBeLessThan(2.9e-4);
  });
});

describe('catalogue', () => {
  it('holds exactly the line ids documented in docs/api.md §Conventions, in order', () => {
    expect(LINES.map((l) => l.id)).toEqual([
      'Ha', 'Hb', 'Hg', 'OIII', 'OIII-496', 'NII-658', 'NII-655', 'SII-671', 'SII-673', 'HeII', 'OI', 'ArIII', 'OII',
    ]);
    expect(EXTRA_LINES.map((l) => l.id)).toEqual(['OII-3729']);
  });

  it('uses the docs/model.md §Lines air wavelengths', () => {
    const air = Object.fromEntries(LINES.map((l) => [l.id, l.airNm]));
    expect(air).toMatchObject({ Ha: 656.28, Hb: 486.13, OIII: 500.68, 'NII-658': 658.35, 'NII-655': 654.8, OII: 372.6 });
  });

  it('rejects an unknown id with a 422 input error', () => {
    expect(() => getLine('Hz')).toThrow(EngineInputError);
    try {
      getLine('Hz');
    } catch (e) {
      expect((e as EngineInputError).status).toBe(422);
    }
  });

  it('names the leaking neighbours of the main nebular lines', () => {
    expect(neighboursOf('Ha').map((l) => l.airNm).sort()).toEqual([654.8, 658.35]);
    expect(neighboursOf('NII-658').map((l) => l.id)).toContain('Ha');
    expect(neighboursOf('OIII').map((l) => l.id)).toEqual(['OIII-496', 'Hb']);
    expect(neighboursOf('SII-671').map((l) => l.id)).toEqual(['SII-673']);
    expect(neighboursOf('SII-673').map((l) => l.id)).toEqual(['SII-671']);
  });
});

describe('Doppler shift', () => {
  it('moves a line by λ·v/c (non-relativistic first order)', () => {
    // 300 km/s recession moves Hα by 656.28 × 300 / 299792.458 ≈ 0.6567 nm.
    expect(dopplerShift(656.28, 300) - 656.28).toBeCloseTo(0.65674, 4);
    expect(dopplerShift(500, -299.792458)).toBeCloseTo(499.5, 9);
  });
});

describe('line colours for charts', () => {
  const rgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));
  it('are valid hex colours', () => {
    for (const nm of [300, 380, 450, 550, 656.28, 800, NaN]) expect(lineColor(nm)).toMatch(/^#[0-9a-f]{6}$/);
  });
  it('put Hα in the red, [O III] in the green–cyan and Hγ in the blue (visible spectrum, common knowledge)', () => {
    const [r1, g1, b1] = rgb(lineColor(656.28));
    expect(r1).toBeGreaterThan(g1);
    expect(r1).toBeGreaterThan(b1);
    const [r2, g2] = rgb(lineColor(500.68));
    expect(g2).toBeGreaterThan(r2);
    const [r3, g3, b3] = rgb(lineColor(434.05));
    expect(b3).toBeGreaterThan(r3);
    expect(b3).toBeGreaterThan(g3);
  });
});
