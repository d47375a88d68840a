/**
 * Keeps the catalogue's derived rows (fitness grid, sparkline) beside each
 * curve. Called when a curve becomes verified, inside the deciding
 * transaction, so a verified curve is never missing from fitness searches.
 */

import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { db } from '@/db/models';
import { computeFitnessGrid, levelOf, LEVEL_STEPS, type GridRow } from './fitness-grid';
import { sparklineOf } from './sparkline';
import { forgetCounts } from './count-cache';
import type { CurvePoints } from '@/lib/engine/types';

export interface DerivedSource {
  id: number;
  lines: string[];
  aoiDeg: number;
  nEff: number | null;
  fwhmNm: number | null;
  points: CurvePoints;
}

export interface DerivedRows {
  fitness: { curveId: number; row: GridRow }[];
  sparklines: { curveId: number; points: CurvePoints }[];
}

export function deriveRows(sources: DerivedSource[]): DerivedRows {
  const out: DerivedRows = { fitness: [], sparklines: [] };
  for (const s of sources) {
    for (const row of computeFitnessGrid({ points: s.points, aoiDeg: s.aoiDeg, nEff: s.nEff, lines: s.lines })) out.fitness.push({ curveId: s.id, row });
    out.sparklines.push({ curveId: s.id, points: sparklineOf(s.points, s.fwhmNm) });
  }
  return out;
}

export const arrayLiteral = (a: ArrayLike<number>) => `{${Array.prototype.join.call(a, ',')}}`;

/** Writes derived rows in two statements, replacing any earlier ones for the same curves. */
export async function writeDerivedRows(rows: DerivedRows, transaction?: Transaction | null, sequelize: Sequelize = db().sequelize): Promise<void> {
  // the public counts change once this commits; forget cached ones then (and now, in case a search caches meanwhile)
  forgetCounts();
  transaction?.afterCommit(() => forgetCounts());
  if (rows.fitness.length > 0) {
    const levels = rows.fitness.flatMap((f) => LEVEL_STEPS.map((_, level) => ({ f, level })));
    await sequelize.query(
      `INSERT INTO curve_fitness (curve_id, line_id, level, primary_line, n_eff_default, direct, canonical)
       SELECT c, l, v, pr, n, d::integer[], nullif(k, '')::integer[]
       FROM unnest($1::int[], $2::text[], $3::smallint[], $4::float8[], $5::text[], $6::text[], $7::boolean[]) AS t(c, l, v, n, d, k, pr)
       ON CONFLICT (line_id, level, curve_id) DO UPDATE SET primary_line = excluded.primary_line, n_eff_default = excluded.n_eff_default,
         direct = excluded.direct, canonical = excluded.canonical`,
      {
        bind: [
          levels.map((x) => x.f.curveId),
          levels.map((x) => x.f.row.lineId),
          levels.map((x) => x.level),
          levels.map((x) => x.f.row.nEffDefault),
          levels.map((x) => arrayLiteral(levelOf(x.f.row.direct, x.level))),
          levels.map((x) => (x.f.row.canonical ? arrayLiteral(levelOf(x.f.row.canonical, x.level)) : '')),
          levels.map((x) => x.f.row.primary),
        ],
        transaction: transaction ?? undefined,
      },
    );
    const fine = rows.fitness.filter((f) => f.row.fine);
    if (fine.length > 0) {
      await sequelize.query(
        `INSERT INTO curve_fitness_fine (curve_id, line_id, fine)
         SELECT c, l, f::integer[] FROM unnest($1::int[], $2::text[], $3::text[]) AS t(c, l, f)
         ON CONFLICT (curve_id, line_id) DO UPDATE SET fine = excluded.fine`,
        {
          bind: [fine.map((f) => f.curveId), fine.map((f) => f.row.lineId), fine.map((f) => arrayLiteral(f.row.fine!))],
          transaction: transaction ?? undefined,
        },
      );
    }
  }
  if (rows.sparklines.length > 0) {
    await sequelize.query(
      `INSERT INTO curve_sparklines (curve_id, wavelength_nm, transmission)
       SELECT c, w::real[], t::real[] FROM unnest($1::int[], $2::text[], $3::text[]) AS s(c, w, t)
       ON CONFLICT (curve_id) DO UPDATE SET wavelength_nm = excluded.wavelength_nm, transmission = excluded.transmission`,
      {
        bind: [
          rows.sparklines.map((s) => s.curveId),
          rows.sparklines.map((s) => arrayLiteral(s.points.wavelengthNm)),
          rows.sparklines.map((s) => arrayLiteral(s.points.transmission)),
        ],
        transaction: transaction ?? undefined,
      },
    );
  }
}

type SourceRow = { id: number; lines: string[]; aoi_deg: number; n_eff: number | null; fwhm_nm: number | null; wavelength_nm: number[]; transmission: number[] };

async function loadSources(where: string, bind: unknown[], transaction?: Transaction | null, sequelize: Sequelize = db().sequelize): Promise<DerivedSource[]> {
  const rows = await sequelize.query<SourceRow>(
    `SELECT id, lines, aoi_deg, n_eff, fwhm_nm, wavelength_nm, transmission FROM curves WHERE ${where}`,
    { bind, type: QueryTypes.SELECT, transaction: transaction ?? undefined },
  );
  return rows.map((r) => ({
    id: r.id, lines: r.lines, aoiDeg: r.aoi_deg, nEff: r.n_eff, fwhmNm: r.fwhm_nm,
    points: { wavelengthNm: r.wavelength_nm, transmission: r.transmission },
  }));
}

export async function storeDerivedForCurves(curveIds: number[], transaction?: Transaction | null): Promise<number> {
  if (curveIds.length === 0) return 0;
  const sources = await loadSources('id = ANY($1::int[])', [curveIds], transaction);
  await writeDerivedRows(deriveRows(sources), transaction);
  return sources.length;
}

/** The curves a "verify" decision has just made public. */
export async function storeDerivedForSubmission(submissionId: number, revision: number, transaction?: Transaction | null): Promise<number> {
  const sources = await loadSources(`submission_id = $1 AND revision = $2 AND status = 'verified'`, [submissionId, revision], transaction);
  await writeDerivedRows(deriveRows(sources), transaction);
  return sources.length;
}

/** Fills the rows for verified curves that have none (a library verified before this table existed). */
export async function backfillDerived(sequelize: Sequelize, batch = 500): Promise<number> {
  let done = 0;
  for (;;) {
    const sources = await loadSources(
      `status = 'verified' AND NOT EXISTS (SELECT 1 FROM curve_sparklines s WHERE s.curve_id = curves.id) ORDER BY id LIMIT ${batch}`,
      [], null, sequelize,
    );
    if (sources.length === 0) return done;
    await writeDerivedRows(deriveRows(sources), null, sequelize);
    done += sources.length;
  }
}
