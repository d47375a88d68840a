/**
 * The representative stacks of docs/model-limits.md and the interpolation the
 * study page uses to say how far a first-order figure can be trusted. The
 * numbers come from scripts/check-first-order.ts (first-order-table.ts).
 *
 * Two families, because the effective index follows the spacer: high-index
 * spacers (n_eff near 1.8–2.0) and low-index spacers (n_eff near 1.5–1.6). A
 * curve is matched to the family whose n_eff is nearer its own, then the
 * table is interpolated bilinearly in FWHM and in 1/N² (the cone's blue shift
 * grows as 1/N²), clamped at the table's edges.
 */

export const LIMIT_LAMBDA0_NM = 656.3;
export const LIMIT_INDICES = { H: 2.35, L: 1.46, incident: 1, substrate: 1.52 };
export const LIMIT_F_NUMBERS = [1.2, 1.4, 1.8, 2.5, 2.8, 3.5, 4, 5.6, 8];
export const LIMIT_OBSTRUCTIONS = [0, 0.36];

export interface LimitDesign {
  name: string;
  formula: string;
  cavities: 2 | 3;
  spacer: 'high' | 'low';
  /** False for a cautionary design kept in the table but not used for the study's figure. */
  interpolate?: boolean;
}

const cavity = (m: number, spacer: string) => `(HL)^${m} ${spacer} (LH)^${m}`;
const two = (m: number, sp: string) => `${cavity(m, sp)} L ${cavity(m, sp)}`;
const three = (m: number, sp: string) => `${two(m, sp)} L ${cavity(m, sp)}`;

export const LIMIT_DESIGNS: LimitDesign[] = [
  { name: 'H2-4H', formula: two(4, '4H'), cavities: 2, spacer: 'high' },
  { name: 'H2-2H', formula: two(4, '2H'), cavities: 2, spacer: 'high' },
  { name: 'H3-4H', formula: three(3, '4H'), cavities: 3, spacer: 'high' },
  { name: 'H3-2H', formula: three(3, '2H'), cavities: 3, spacer: 'high' },
  // weak two-pair mirrors under-couple the cavities: the passband splits into two lobes that move apart with
  // angle, which a shape-keeping model cannot follow. Kept to show where first order breaks; not interpolated.
  { name: 'H2-4H-lobed', formula: two(2, '4H'), cavities: 2, spacer: 'high', interpolate: false },
  { name: 'L2-6L', formula: two(4, '6L'), cavities: 2, spacer: 'low' },
  { name: 'L2-2L', formula: two(4, '2L'), cavities: 2, spacer: 'low' },
  { name: 'L3-6L', formula: three(3, '6L'), cavities: 3, spacer: 'low' },
  { name: 'L3-2L', formula: three(3, '2L'), cavities: 3, spacer: 'low' },
  { name: 'L3-2L-wide', formula: `${cavity(2, 'H 2L H')} L ${cavity(2, 'H 2L H')} L ${cavity(2, 'H 2L H')}`, cavities: 3, spacer: 'low' },
];

export interface LimitCell {
  /** Largest overstatement in the passband, percentage points. */
  over: number;
  /** Largest understatement in the passband, percentage points. */
  under: number;
  /** First order minus exact at the first-order best pre-shift, points. */
  atBest: number;
}

export interface LimitRow {
  name: string;
  formula: string;
  cavities: 2 | 3;
  spacer: 'high' | 'low';
  interpolate?: boolean;
  fwhmNm: number;
  nEff: number;
  peakT: number;
  /** One per LIMIT_F_NUMBERS entry. */
  cells: LimitCell[];
}

export interface FirstOrderTrust {
  over: number;
  under: number;
  /** "within 1 point here" or "first order overstates by up to N points at this speed". */
  sentence: string;
  /** Rows the figure was interpolated from, for the docs link. */
  family: 'high' | 'low';
  clamped: boolean;
}

function bracket(xs: number[], x: number): { i: number; t: number; clamped: boolean } {
  if (x <= xs[0]) return { i: 0, t: 0, clamped: x < xs[0] };
  const n = xs.length;
  if (x >= xs[n - 1]) return { i: n - 2, t: 1, clamped: x > xs[n - 1] };
  let i = 0;
  while (xs[i + 1] < x) i++;
  return { i, t: (x - xs[i]) / (xs[i + 1] - xs[i]), clamped: false };
}

export function firstOrderTrust(table: LimitRow[], q: { fNumber: number; fwhmNm: number; nEff: number }): FirstOrderTrust | null {
  if (!(q.fNumber > 0) || !(q.fwhmNm > 0) || !(q.nEff > 0) || table.length === 0) return null;
  const mean = (s: 'high' | 'low') => {
    const r = table.filter((x) => x.spacer === s && x.interpolate !== false);
    return r.length ? r.reduce((a, x) => a + x.nEff, 0) / r.length : NaN;
  };
  const hi = mean('high');
  const lo = mean('low');
  const family: 'high' | 'low' = Number.isNaN(lo) || Math.abs(q.nEff - hi) <= Math.abs(q.nEff - lo) ? 'high' : 'low';
  const rows = table.filter((r) => r.spacer === family && r.interpolate !== false).sort((a, b) => a.fwhmNm - b.fwhmNm);
  if (rows.length === 0) return null;
  // 1/N² falls as N grows; bracket on the ascending list of N and interpolate linearly in 1/N²
  const fs = LIMIT_F_NUMBERS;
  const fb = bracket(fs, q.fNumber);
  const inv = (f: number) => 1 / (f * f);
  const tf = fb.t === 0 || fb.t === 1 ? fb.t : (inv(q.fNumber) - inv(fs[fb.i])) / (inv(fs[fb.i + 1]) - inv(fs[fb.i]));
  const wb = rows.length > 1 ? bracket(rows.map((r) => r.fwhmNm), q.fwhmNm) : { i: 0, t: 0, clamped: true };
  const at = (r: LimitRow, key: 'over' | 'under') => (1 - tf) * r.cells[fb.i][key] + tf * r.cells[Math.min(fb.i + 1, fs.length - 1)][key];
  const value = (key: 'over' | 'under') => {
    const a = at(rows[wb.i], key);
    const b = rows.length > 1 ? at(rows[wb.i + 1], key) : a;
    return (1 - wb.t) * a + wb.t * b;
  };
  const over = value('over');
  const under = value('under');
  const worst = Math.max(over, under);
  const n = Math.max(1, Math.ceil(worst - 1e-9));
  const sentence =
    worst < 1
      ? 'within 1 point here'
      : over >= under
        ? `first order overstates by up to ${n} points at this speed`
        : `first order understates by up to ${n} points at this speed`;
  return { over, under, sentence, family, clamped: fb.clamped || wb.clamped };
}
