import 'server-only';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { readableWhere } from './points';
import { opticChoices, type OpticChoice } from './optic-choices';
import { curveTitle } from './detail';

/** A curve on the compare board: its numbers and its points. */
export interface CompareCurve {
  id: number;
  title: string;
  label: string;
  maker: string | null;
  lines: string[];
  status: string;
  instrument: string;
  aoiDeg: number;
  nEff: number | null;
  peakT: number;
  cwlNm: number | null;
  fwhmNm: number | null;
  meanInBandT: number | null;
  effectiveBandwidthNm: number | null;
  blockingOd: number | null;
  contributor: string | null;
  licence: string;
  points: { wavelengthNm: number[]; transmission: number[] };
}

export type CompareBoardView = { curves: CompareCurve[]; missing: number[]; optics: OpticChoice[] };

/** The compare board of the ids in its address, in their order, in one query; ids the reader may not see are "missing". */
export async function getCompareBoard(actor: Actor | null, ids: number[]): Promise<CompareBoardView> {
  const { Curve, User } = db();
  const rows = ids.length
    ? await Curve.scope('withPoints').findAll({
        where: { id: ids, ...readableWhere(actor) },
        include: [{ model: User, as: 'contributor', attributes: ['name'] }],
      })
    : [];
  const byId = new Map(rows.map((r) => [r.id, r]));
  const curves: CompareCurve[] = ids
    .map((id) => byId.get(id))
    .filter((c): c is NonNullable<typeof c> => !!c)
    .map((c) => ({
      id: c.id,
      title: curveTitle(c),
      label: c.label,
      maker: c.maker,
      lines: c.lines,
      status: c.status,
      instrument: c.instrument,
      aoiDeg: c.aoiDeg,
      nEff: c.nEff,
      peakT: c.peakT,
      cwlNm: c.cwlNm,
      fwhmNm: c.fwhmNm,
      meanInBandT: c.meanInBandT,
      effectiveBandwidthNm: c.effectiveBandwidthNm,
      blockingOd: c.blockingOd,
      contributor: (c as unknown as { contributor?: { name: string | null } }).contributor?.name ?? null,
      licence: c.licence,
      points: { wavelengthNm: c.wavelengthNm, transmission: c.transmission },
    }));
  const missing = ids.filter((id) => !byId.has(id));
  return { curves, missing, optics: await opticChoices(actor) };
}
