import 'server-only';
import { readCatalogue } from './read-source';
import { db } from '@/db/models';
import { findLine } from '@/lib/engine/lines';
import { MIN_UNITS, oddsSentence, unitOdds, type OddsResult } from '@/lib/engine/odds';
import { buildPupil } from '@/lib/engine/pupil';
import type { OddsQuery } from '@/lib/schemas/odds';
import { defaultNEff } from './fitness-grid';
import { curvePointsByIds } from './points';
import { oneCurvePerUnit, UNIT_ATTRIBUTES } from './units';

/** At most this many units of one label are read (the curve page's unit spread reads as many). */
const MAX_UNITS = 500;
/** Answers are kept this long per query: a catalogue page asks for the same label many times. */
const TTL_MS = 60_000;
const CACHE_LIMIT = 500;
const cache = new Map<string, { at: number; value: OddsAnswer }>();

export interface OddsAnswer {
  label: string;
  line: { id: string | null; wavelengthNm: number };
  units: number;
  meeting: number;
  probability: number | null;
  cwlSpreadNm: OddsResult['cwlSpreadNm'];
  fwhmSpreadNm: OddsResult['fwhmSpreadNm'];
  distribution: string;
  /** "7 of 9 measured units; about 80 % of units, from 9 measurements". */
  sentence: string;
  minUnits: number;
  reason?: string;
}

/**
 * The odds that a unit of `label` keeps at least minThroughput of the line on
 * this optic: counted over the verified normal-incidence units (the same units
 * as the curve page's unit spread), and from a fitted spread (lib/engine/odds.ts).
 */
export async function labelOdds(q: OddsQuery): Promise<OddsAnswer> {
  const key = JSON.stringify(q);
  const hit = cache.get(key);
  if (hit && Date.now() - hit.at < TTL_MS) return hit.value;

  const { found, byId } = await readCatalogue(async () => {
    const { Curve } = db();
    const units = oneCurvePerUnit(await Curve.findAll({ where: { label: q.label, status: 'verified', aoiDeg: 0 }, attributes: ['id', 'label', ...UNIT_ATTRIBUTES], order: [['id', 'ASC']], limit: MAX_UNITS }));
    return { found: units, byId: await curvePointsByIds(units.map((c) => c.id)) };
  });
  const rows = found.flatMap((c) => {
    const u = byId.get(c.id);
    return u ? [{ label: c.label, nEff: u.nEff, points: u.points }] : [];
  });
  const known = findLine(q.line);
  const lineNm = known ? known.airNm : Number(q.line);
  const pupil = buildPupil({ fNumber: q.fNumber, obstruction: q.obstruction ?? 0, fieldAngleDeg: q.fieldAngleDeg ?? 0 });
  const r = unitOdds({
    units: rows.map((c) => ({ points: c.points, nEff: q.nEff ?? defaultNEff(c.nEff) })),
    pupil,
    lineNm,
    minThroughput: q.minThroughput,
    preShiftNm: q.preShiftNm,
    nEff: q.nEff,
  });
  const reason = rows.length === 0 ? `No verified unit measured at normal incidence carries the label "${q.label}".` : r.reason;
  const value: OddsAnswer = {
    label: rows[0]?.label ?? q.label,
    line: { id: known?.id ?? null, wavelengthNm: lineNm },
    units: r.units,
    meeting: r.meeting,
    probability: r.probability,
    cwlSpreadNm: r.cwlSpreadNm,
    fwhmSpreadNm: r.fwhmSpreadNm,
    distribution: r.distribution,
    sentence: oddsSentence({ ...r, reason }),
    minUnits: MIN_UNITS,
    ...(reason ? { reason } : {}),
  };
  cache.set(key, { at: Date.now(), value });
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  return value;
}
