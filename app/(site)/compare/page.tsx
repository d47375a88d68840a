import type { Metadata } from 'next';
import { Suspense } from 'react';
import { currentActor } from '@/lib/auth/actor';
import { getCompareBoard } from '@/lib/catalogue/compare-board';
import { CompareView } from '@/components/catalogue/compare-view';
import { parseCompareIds, parseCompareOptic } from '@/lib/catalogue/compare';

export const metadata: Metadata = { title: 'Compare board' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function ComparePage({ searchParams }: Props) {
  const raw = await searchParams;
  const ids = parseCompareIds(raw.curves);
  const searchOptic = parseCompareOptic(raw);
  const actor = await currentActor().catch(() => null);
  const { curves, missing, optics } = await getCompareBoard(actor, ids);
  return (
    <Suspense>
      <CompareView curves={curves} missing={missing} optics={optics} searchOptic={searchOptic} />
    </Suspense>
  );
}
