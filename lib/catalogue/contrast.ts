/**
 * "Best contrast on this optic": curves ordered by their background-limited
 * contrast under a sky model, gain = (τ/τ_ref)/sqrt(B/B_ref) (lib/engine/sky.ts).
 * The reference is an ideal 10 nm box at each curve's own line, so the order is
 * that of τ/√B whatever the reference.
 *
 * The stored grid holds only short intervals redward of each line, not the
 * whole passband and its far wings where sky lines and continuum come in, so
 * this sort cannot be read from it. It is computed exactly, with the engine, on
 * a bounded candidate set: the CONTRAST_CANDIDATES curves with the highest line
 * throughput among those the filters keep. Both ways of answering a search (SQL
 * and the in-process copy) pick the same candidates, so they agree.
 */

import { buildPupil } from '@/lib/engine/pupil';
import { prepareCurve } from '@/lib/engine/curve';
import { findLine } from '@/lib/engine/lines';
import { boxReference, contrastGain, findSkyModel, skyLeakage } from '@/lib/engine/sky';
import { lineThroughput } from '@/lib/engine/cone';
import { defaultNEff, opticOf } from './fitness-grid';
import { curvePointsByIds } from './points';
import type { SearchParams } from './search-params';

export const CONTRAST_CANDIDATES = 200;
export const CONTRAST_REFERENCE_BOX_NM = 10;
export const DEFAULT_CONTRAST_SKY = 'suburban';

export interface ContrastRow {
  id: number;
  lines: string[];
}

/** Gain of each candidate over an ideal 10 nm box under the search's sky; null when undefined. */
export async function contrastOf(p: SearchParams & { fNumber: number }, rows: ContrastRow[]): Promise<Map<number, number | null>> {
  const sky = findSkyModel(p.sky ?? DEFAULT_CONTRAST_SKY)!;
  const pupil = buildPupil(opticOf({ fNumber: p.fNumber, obstruction: p.obstruction ?? 0, nEff: p.nEff, fieldAngleDeg: p.fieldAngleDeg }));
  const points = await curvePointsByIds(rows.map((r) => r.id));
  const out = new Map<number, number | null>();
  for (const r of rows) {
    const stored = points.get(r.id);
    const line = findLine(p.line ?? r.lines[0] ?? '');
    if (!stored || !line) {
      out.set(r.id, null);
      continue;
    }
    const c = prepareCurve(stored.points);
    const params = { nEff: p.nEff ?? defaultNEff(stored.nEff), measuredAoiDeg: stored.aoiDeg };
    const tau = lineThroughput(c, pupil, line.airNm, params).throughput;
    const b = skyLeakage(c, pupil, params, line.airNm, sky).background;
    const ref = boxReference(CONTRAST_REFERENCE_BOX_NM, line.airNm, sky);
    out.set(r.id, contrastGain(tau, b, ref.throughput, ref.background));
  }
  return out;
}

/** Orders by gain (nulls last, ties by id in the same direction, like every other sort). */
export function byContrast(gain: Map<number, number | null>, dir: 'asc' | 'desc') {
  const desc = dir === 'desc';
  return (a: { id: number }, b: { id: number }) => {
    const x = gain.get(a.id) ?? null;
    const y = gain.get(b.id) ?? null;
    if ((x === null) !== (y === null)) return x === null ? 1 : -1;
    if (x !== null && y !== null && x !== y) return desc ? y - x : x - y;
    return desc ? b.id - a.id : a.id - b.id;
  };
}
