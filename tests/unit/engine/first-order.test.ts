import { describe, expect, it } from 'vitest';
import { firstOrderGap, summariseDesign } from '@/lib/engine/first-order-check';
import { firstOrderTrust, LIMIT_DESIGNS, LIMIT_F_NUMBERS, LIMIT_INDICES, LIMIT_LAMBDA0_NM, LIMIT_OBSTRUCTIONS, type LimitRow } from '@/lib/engine/first-order-designs';
import { FIRST_ORDER_TABLE } from '@/lib/engine/first-order-table';

describe('first order against the exact stack', () => {
  it('the committed table holds every design and f-number', () => {
    expect(FIRST_ORDER_TABLE.map((r) => r.formula)).toEqual(LIMIT_DESIGNS.map((d) => d.formula));
    for (const r of FIRST_ORDER_TABLE) {
      expect(r.cells).toHaveLength(LIMIT_F_NUMBERS.length);
      expect(r.fwhmNm).toBeGreaterThan(1.5);
      expect(r.peakT).toBeGreaterThan(0.95);
    }
  });

  it('well-coupled designs stay within 1 point from f/1.2 to f/8; the under-coupled one does not, and is not used by the study', () => {
    for (const r of FIRST_ORDER_TABLE.filter((x) => x.interpolate !== false)) for (const c of r.cells) expect(Math.max(c.over, c.under), r.name).toBeLessThan(1);
    const lobed = FIRST_ORDER_TABLE.find((x) => x.interpolate === false)!;
    expect(Math.max(...lobed.cells.map((c) => Math.max(c.over, c.under)))).toBeGreaterThan(5);
  });

  it('one cell recomputed from the characteristic matrix matches the committed table (it is not typed by hand)', () => {
    const row = FIRST_ORDER_TABLE.find((r) => r.name === 'H2-2H')!;
    const s = summariseDesign({ formula: row.formula, lambda0Nm: LIMIT_LAMBDA0_NM, indices: LIMIT_INDICES });
    expect(s.fwhmNm).toBeCloseTo(row.fwhmNm, 2);
    expect(s.nEff).toBeCloseTo(row.nEff, 3);
    const fi = LIMIT_F_NUMBERS.indexOf(4);
    const gaps = LIMIT_OBSTRUCTIONS.map((obstruction) => firstOrderGap(s, { fNumber: 4, obstruction }));
    expect(Math.max(...gaps.map((g) => g.over))).toBeCloseTo(row.cells[fi].over, 2);
    expect(Math.max(...gaps.map((g) => g.under))).toBeCloseTo(row.cells[fi].under, 2);
  });

  it('the fitted effective index of a high-index-spacer stack lies between n_L and n_H (Macleod ch. 7)', () => {
    for (const r of FIRST_ORDER_TABLE) {
      expect(r.nEff).toBeGreaterThan(LIMIT_INDICES.L);
      expect(r.nEff).toBeLessThan(LIMIT_INDICES.H);
      if (r.spacer === 'high') expect(r.nEff).toBeGreaterThan(Math.sqrt(LIMIT_INDICES.H * LIMIT_INDICES.L) - 0.05);
    }
  });
});

describe('how far the first-order figure can be trusted', () => {
  const cells = (v: number) => LIMIT_F_NUMBERS.map((f) => ({ over: v / (f * f), under: 0, atBest: 0 }));
  const table: LimitRow[] = [
    { name: 'a', formula: 'H', cavities: 2, spacer: 'high', fwhmNm: 2, nEff: 2, peakT: 1, cells: cells(40) },
    { name: 'b', formula: 'H', cavities: 2, spacer: 'high', fwhmNm: 10, nEff: 2, peakT: 1, cells: cells(20) },
    { name: 'c', formula: 'L', cavities: 2, spacer: 'low', fwhmNm: 5, nEff: 1.55, peakT: 1, cells: LIMIT_F_NUMBERS.map(() => ({ over: 0, under: 3, atBest: 0 })) },
  ];

  it('reproduces the table at its nodes and interpolates in 1/N² and FWHM between them', () => {
    const at = firstOrderTrust(table, { fNumber: 1.4, fwhmNm: 2, nEff: 2 })!;
    expect(at.over).toBeCloseTo(40 / 1.96, 10);
    // halfway in FWHM between rows a and b at f/1.4
    expect(firstOrderTrust(table, { fNumber: 1.4, fwhmNm: 6, nEff: 2 })!.over).toBeCloseTo(30 / 1.96, 10);
    // between f/1.4 and f/1.8, linear in 1/N² reproduces a 1/N² law exactly
    expect(firstOrderTrust(table, { fNumber: 1.6, fwhmNm: 2, nEff: 2 })!.over).toBeCloseTo(40 / 2.56, 10);
  });

  it('clamps outside the table and says so', () => {
    const fast = firstOrderTrust(table, { fNumber: 1, fwhmNm: 1, nEff: 2.1 })!;
    expect(fast.over).toBeCloseTo(40 / 1.44, 10);
    expect(fast.clamped).toBe(true);
    expect(firstOrderTrust(table, { fNumber: 3, fwhmNm: 5, nEff: 2 })!.clamped).toBe(false);
  });

  it('picks the spacer family by n_eff and words the sentence by size and sign', () => {
    expect(firstOrderTrust(table, { fNumber: 1.2, fwhmNm: 2, nEff: 1.9 })!.sentence).toBe('first order overstates by up to 28 points at this speed');
    const low = firstOrderTrust(table, { fNumber: 2.5, fwhmNm: 5, nEff: 1.5 })!;
    expect(low.family).toBe('low');
    expect(low.sentence).toBe('first order understates by up to 3 points at this speed');
    expect(firstOrderTrust(table, { fNumber: 8, fwhmNm: 10, nEff: 2 })!.sentence).toBe('within 1 point here');
    expect(firstOrderTrust(table, { fNumber: 0, fwhmNm: 10, nEff: 2 })).toBeNull();
  });
});
