/**
 * One catalogue row per physical unit. A unit measured at several angles of
 * incidence is a curve set (curves sharing `set_key` and `revision`, stored
 * from one submission and decided together); the catalogue lists it once, by
 * its lead curve, the one measured closest to normal incidence (lowest AOI,
 * then lowest id), and names the set's angles and curves in the row.
 *
 * Its CWL in tables, filters and the CWL order is at normal incidence, brought
 * there by the engine's rule λ0 = λθ / s(θ) (normalIncidenceNm) with the set's
 * fitted n_eff, else 2.0, exactly as the fitness search brings curves to normal
 * incidence (defaultNEff); `measuredCwlNm` keeps the value as measured.
 *
 * Both ways of answering a search use these: the SQL in search.ts and the
 * in-process copy in memory-search.ts (tests/integration/catalogue-memory.test.ts).
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { normalIncidenceNm } from '@/lib/engine/cone';
import { angleScaleSql } from '@/lib/engine/angles';
import { defaultNEff, DEFAULT_N_EFF } from './fitness-grid';

/** The CWL a catalogue row shows and filters on: at normal incidence. */
export function normalCwlNm(measuredCwlNm: number | null, aoiDeg: number, nEff: number | null): number | null {
  if (measuredCwlNm === null || !Number.isFinite(measuredCwlNm)) return null;
  return normalIncidenceNm(measuredCwlNm, aoiDeg, defaultNEff(nEff));
}

/**
 * normalCwlNm in SQL, for the filter and the order: cwl / s(θ) (angleScaleSql) with
 * n as defaultNEff picks it (a fitted value within [1, 4], else DEFAULT_N_EFF).
 * The integration test holds it equal to normalCwlNm for every curve.
 */
export function normalCwlSql(c: string): string {
  const n = `(CASE WHEN ${c}.n_eff >= 1 AND ${c}.n_eff <= 4 THEN ${c}.n_eff ELSE ${DEFAULT_N_EFF} END)`;
  return `(CASE WHEN ${c}.aoi_deg > 0 THEN ${c}.cwl_nm / ${angleScaleSql(`${c}.aoi_deg`, n)} ELSE ${c}.cwl_nm END)`;
}

/**
 * True for a curve that stands for its unit: no set, or the set's lead. The
 * members compared are those of the same status, which every member of a set
 * shares (a submission is decided as a whole), so whoever may read the lead may
 * read the set.
 */
export function unitLeadSql(c: string): string {
  return `(${c}.set_key IS NULL OR NOT EXISTS (SELECT 1 FROM curves u WHERE u.set_key = ${c}.set_key AND u.revision = ${c}.revision
     AND u.status = ${c}.status AND (u.aoi_deg < ${c}.aoi_deg OR (u.aoi_deg = ${c}.aoi_deg AND u.id < ${c}.id))))`;
}

/** The lead of each unit among rows of one status: 1 for a lead, 0 for another member of its set. */
export function unitLeads(ids: ArrayLike<number>, aoi: ArrayLike<number>, unitKey: ArrayLike<number>): Uint8Array {
  const n = ids.length;
  const lead = new Uint8Array(n).fill(1);
  const best = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const k = unitKey[i];
    if (k < 0) continue;
    const j = best.get(k);
    if (j === undefined) {
      best.set(k, i);
      continue;
    }
    const before = aoi[i] < aoi[j] || (aoi[i] === aoi[j] && ids[i] < ids[j]);
    lead[before ? j : i] = 0;
    if (before) best.set(k, i);
  }
  return lead;
}

/** What a catalogue row says of its unit's set: every angle measured, and the curve of each. */
export interface UnitSet {
  aoiDeg: number[];
  curveIds: number[];
}

/** The set of each lead on a page (a curve without a set is a set of one), members of the lead's status, by angle. */
export async function unitSetsOf(leads: { id: number; aoiDeg: number }[]): Promise<Map<number, UnitSet>> {
  const out = new Map<number, UnitSet>(leads.map((l) => [l.id, { aoiDeg: [l.aoiDeg], curveIds: [l.id] }]));
  if (!leads.length) return out;
  const rows = await db().sequelize.query<{ lead: number; id: number; aoi_deg: number }>(
    `SELECT l.id AS lead, m.id, m.aoi_deg FROM curves l JOIN curves m
       ON m.set_key = l.set_key AND m.revision = l.revision AND m.status = l.status
     WHERE l.id = ANY($1::int[]) AND l.set_key IS NOT NULL
     ORDER BY l.id, m.aoi_deg, m.id`,
    { bind: [leads.map((l) => l.id)], type: QueryTypes.SELECT },
  );
  const grouped = new Map<number, UnitSet>();
  for (const r of rows) {
    const g = grouped.get(r.lead) ?? { aoiDeg: [], curveIds: [] };
    g.aoiDeg.push(r.aoi_deg);
    g.curveIds.push(r.id);
    grouped.set(r.lead, g);
  }
  for (const [id, g] of grouped) out.set(id, g);
  return out;
}

/**
 * One curve per physical unit for the unit-to-unit spread and odds of a label.
 * A set measured at several temperatures holds several normal-incidence curves
 * of one unit; counting each would read the unit's temperature drift as a
 * spread between units. Of a set's normal-incidence curves the one measured
 * nearest room temperature (20 °C; a curve with no temperature counts as 20 °C)
 * stands for the unit, the lowest id breaking ties. Curves outside a set are
 * units of their own.
 */
export const UNIT_ATTRIBUTES = ['setKey', 'method'] as const;

const ROOM_C = 20;

export function oneCurvePerUnit<T extends { id: number; setKey: string | null; method: unknown }>(curves: T[]): T[] {
  const best = new Map<string, T>();
  const distance = (c: T) => {
    const t = (c.method as { temperatureC?: unknown } | null)?.temperatureC;
    return typeof t === 'number' && Number.isFinite(t) ? Math.abs(t - ROOM_C) : 0;
  };
  for (const c of curves) {
    if (!c.setKey) continue;
    const held = best.get(c.setKey);
    if (!held || distance(c) < distance(held) || (distance(c) === distance(held) && c.id < held.id)) best.set(c.setKey, c);
  }
  return curves.filter((c) => !c.setKey || best.get(c.setKey) === c);
}
