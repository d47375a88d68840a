/**
 * For my target: a source's redshift moves every line, λ = λ₀·(1 + z) (a radial
 * velocity v is the same with z = v/c, as `dopplerShift` applies it); fixed-ratio
 * doublets count together; a dual- or tri-band curve reports each of its lines
 * and a weighted total
 *   τ_total = Σ wᵢ τᵢ / Σ wᵢ,
 * with wᵢ the strength the user gives (default 1 each) and a doublet's weaker
 * member at its parent's weight divided by the fixed ratio.
 */

import { SPEED_OF_LIGHT_KMS } from './lines';

export interface Doublet {
  /** The stronger member (the catalogue's line id). */
  primary: string;
  /** The weaker member. */
  partner: string;
  /** Intensity ratio primary : partner. */
  ratio: number;
}

/**
 * Fixed doublet ratios set by the atomic transition probabilities, independent
 * of the gas: [O III] 500.7/495.9 ≈ 2.98 and [N II] 658.3/654.8 ≈ 2.94
 * (P. J. Storey & C. J. Zeippen 2000, MNRAS 312, 813; from memory). [S II]
 * 671.6/673.1 depends on the electron density, so it is not fixed here.
 */
export const DOUBLETS: readonly Doublet[] = Object.freeze([
  { primary: 'OIII', partner: 'OIII-496', ratio: 2.98 },
  { primary: 'NII-658', partner: 'NII-655', ratio: 2.94 },
]);

export interface GalaxyPreset {
  id: string;
  name: string;
  z: number;
}

/**
 * A few nearby galaxies with their heliocentric redshifts (NASA/IPAC
 * Extragalactic Database, NED; values from memory, rounded).
 */
export const GALAXY_PRESETS: readonly GalaxyPreset[] = Object.freeze([
  { id: 'M31', name: 'Andromeda Galaxy (M31)', z: -0.001001 },
  { id: 'M33', name: 'Triangulum Galaxy (M33)', z: -0.000597 },
  { id: 'M81', name: "Bode's Galaxy (M81)", z: -0.000113 },
  { id: 'M82', name: 'Cigar Galaxy (M82)', z: 0.000677 },
  { id: 'M51', name: 'Whirlpool Galaxy (M51)', z: 0.001544 },
  { id: 'M101', name: 'Pinwheel Galaxy (M101)', z: 0.000804 },
  { id: 'NGC253', name: 'Sculptor Galaxy (NGC 253)', z: 0.000811 },
  { id: 'M87', name: 'Virgo A (M87)', z: 0.004283 },
]);

/** λ₀·(1 + z). */
export function redshift(restNm: number, z: number): number {
  return restNm * (1 + z);
}

/** The radial velocity that moves lines exactly as z does under `dopplerShift` (v = c·z). */
export function velocityForZ(z: number): number {
  return z * SPEED_OF_LIGHT_KMS;
}

export function doubletOf(id: string): Doublet | undefined {
  return DOUBLETS.find((d) => d.primary === id || d.partner === id);
}

export interface WeightedLine {
  id: string;
  /** Relative strength used in the total. */
  weight: number;
  /** Whether the line was added as a doublet partner rather than asked for. */
  fromDoublet: boolean;
}

/**
 * The lines a total is made of: those asked for with their weights (default 1),
 * plus, when doublets count, each missing partner at its parent's weight over the
 * ratio (or the primary at the partner's weight times the ratio).
 */
export function weightedLines(ids: string[], weights: Partial<Record<string, number>> = {}, doublets = false): WeightedLine[] {
  const out: WeightedLine[] = ids.map((id) => ({ id, weight: weights[id] ?? 1, fromDoublet: false }));
  if (!doublets) return out;
  for (const l of [...out]) {
    const d = doubletOf(l.id);
    if (!d) continue;
    const other = d.primary === l.id ? d.partner : d.primary;
    if (out.some((x) => x.id === other)) continue;
    const weight = weights[other] ?? (d.primary === l.id ? l.weight / d.ratio : l.weight * d.ratio);
    out.push({ id: other, weight, fromDoublet: true });
  }
  return out;
}

/** Σ wᵢ τᵢ / Σ wᵢ; null without positive weight. */
export function weightedTotal(items: { weight: number; throughput: number }[]): number | null {
  let w = 0;
  let s = 0;
  for (const i of items) {
    w += i.weight;
    s += i.weight * i.throughput;
  }
  return w > 0 ? s / w : null;
}
