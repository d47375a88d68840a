import 'server-only';
import { db } from '@/db/models';
import type { Curve } from '@/db/models/curve';
import type { Actor } from '@/lib/auth/actor';
import type { CurvePoints } from '@/lib/engine/types';
import { readableWhere } from './points';
import { opticChoices, type OpticChoice } from './optic-choices';
import { curveTitle } from './detail';

/** A curve on the compare board: its stored numbers (the model's own fields) and its points. */
export type CompareCurve = Pick<
  Curve,
  'label' | 'maker' | 'lines' | 'status' | 'instrument' | 'aoiDeg' | 'nEff' | 'peakT' | 'cwlNm' | 'fwhmNm' | 'meanInBandT' | 'effectiveBandwidthNm' | 'blockingOd' | 'licence'
> & { id: number; title: string; contributor: string | null; points: CurvePoints };

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
