import { literal, QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { readableCurvesSql, readableCurvesWhere } from '@/lib/auth/policy';
import { notFound } from '@/lib/http/errors';
import type { CurvePoints } from '@/lib/engine/types';
import { binaryArraySql, readFloat8Array } from './binary-array';
import { readCatalogue } from './read-source';

/** Who reads which curves: the READ rule of lib/auth/policy.ts. */
export const readableWhere = readableCurvesWhere;

/** One curve the caller may read (on the read replica when one serves: curve pages, downloads, model calls). */
export function loadReadableCurve(actor: Actor | null, id: number, withPoints = true) {
  return readCatalogue(async () => {
    const { Curve } = db();
    // the samples travel in binary (binary-array.ts): as text they cost both ends more than the rest of the read
    const binary: [ReturnType<typeof literal>, string][] = withPoints
      ? [[literal(binaryArraySql('wavelength_nm')), 'wavelengthBinary'], [literal(binaryArraySql('transmission')), 'transmissionBinary']]
      : [];
    const curve = await Curve.findOne({ where: { id, ...readableWhere(actor) }, attributes: { include: binary } });
    if (!curve) throw notFound(`No curve ${id} that you can read.`);
    if (withPoints) {
      curve.setDataValue('wavelengthNm', readFloat8Array(curve.getDataValue('wavelengthBinary' as never)));
      curve.setDataValue('transmission', readFloat8Array(curve.getDataValue('transmissionBinary' as never)));
    }
    return curve;
  });
}

/** A readable curve's samples and what the engine needs beside them. */
export interface ReadableSamples {
  id: number;
  aoiDeg: number;
  method: Record<string, unknown>;
  points: CurvePoints;
}

/**
 * The samples of one curve the caller may read, in one plain statement (points downloads, model
 * calls, sky references, field maps): no model instance is built, which cost those requests more
 * than the read itself. The READ rule is the policy's SQL form of the rule loadReadableCurve applies.
 */
export function loadReadableSamples(actor: Actor | null, id: number): Promise<ReadableSamples> {
  return readCatalogue(async () => {
    const bind: unknown[] = [id];
    const rule = readableCurvesSql(actor, (value, cast = '') => (bind.push(value), `$${bind.length}${cast}`));
    const [row] = await db().sequelize.query<{ id: number; aoi_deg: number; method: Record<string, unknown> | null; w: Buffer; t: Buffer }>(
      `SELECT c.id, c.aoi_deg, c.method, ${binaryArraySql('c.wavelength_nm')} AS w, ${binaryArraySql('c.transmission')} AS t
       FROM curves c WHERE c.id = $1 AND (${rule})`,
      { bind, type: QueryTypes.SELECT },
    );
    if (!row) throw notFound(`No curve ${id} that you can read.`);
    return { id: row.id, aoiDeg: row.aoi_deg, method: row.method ?? {}, points: { wavelengthNm: readFloat8Array(row.w), transmission: readFloat8Array(row.t) } };
  });
}

/** Whole curves by id for the engine (no readability check: callers pass ids a search has already filtered), sent in binary form. */
export async function curvePointsByIds(
  ids: number[],
): Promise<Map<number, { aoiDeg: number; nEff: number | null; fwhmNm: number | null; method: Record<string, unknown>; points: CurvePoints }>> {
  if (ids.length === 0) return new Map();
  const rows = await db().sequelize.query<{ id: number; aoi_deg: number; n_eff: number | null; fwhm_nm: number | null; method: Record<string, unknown>; w: Buffer; t: Buffer }>(
    `SELECT id, aoi_deg, n_eff, fwhm_nm, method, ${binaryArraySql('wavelength_nm')} AS w, ${binaryArraySql('transmission')} AS t FROM curves WHERE id = ANY($1::int[])`,
    { bind: [ids], type: QueryTypes.SELECT },
  );
  return new Map(
    rows.map((r) => [r.id, { aoiDeg: r.aoi_deg, nEff: r.n_eff, fwhmNm: r.fwhm_nm, method: r.method ?? {}, points: { wavelengthNm: readFloat8Array(r.w), transmission: readFloat8Array(r.t) } }]),
  );
}
