import type { Metadata } from 'next';
import { Suspense } from 'react';
import { currentActor } from '@/lib/auth/actor';
import { db } from '@/db/models';
import { readableWhere } from '@/lib/catalogue/points';
import { opticChoices } from '@/lib/catalogue/optic-choices';
import { curveTitle } from '@/lib/catalogue/detail';
import { CompareView, type CompareCurve } from '@/components/catalogue/compare-view';
import { parseCompareIds, parseCompareOptic } from '@/lib/catalogue/compare';

export const metadata: Metadata = { title: 'Compare board' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function ComparePage({ searchParams }: Props) {
  const raw = await searchParams;
  const ids = parseCompareIds(raw.curves);
  const searchOptic = parseCompareOptic(raw);
  const actor = await currentActor().catch(() => null);
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
  const optics = await opticChoices(actor);
  return (
    <Suspense>
      <CompareView curves={curves} missing={missing} optics={optics} searchOptic={searchOptic} />
    </Suspense>
  );
}
