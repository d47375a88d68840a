'use client';

import Link from 'next/link';
import type { CompareOptic } from '@/lib/catalogue/compare';
import { MAX_COMPARE, compareHref, useCompareBoard } from './compare-board';

/** A bar that follows the reader down the results: what is on the compare board, and the way there. */
export function CompareTray({ optic }: { optic?: CompareOptic | null }) {
  const { ids, clear } = useCompareBoard();
  if (ids.length === 0) return null;
  return (
    <div role="region" aria-label="Compare board" className="sticky bottom-3 z-10 mx-auto flex w-fit max-w-full flex-wrap items-center gap-3 rounded-card border border-rule bg-panel px-4 py-2 text-sm shadow-lg" data-testid="compare-tray">
      <span>
        <strong className="figures">{ids.length}</strong> of {MAX_COMPARE} curves on the compare board
      </span>
      <Link href={compareHref(ids, optic)} className="rounded-card bg-accent px-3 py-1 text-accent-ink" data-testid="open-compare">
        Open compare board
      </Link>
      <button type="button" onClick={clear} className="text-muted underline-offset-4 hover:underline">
        Clear
      </button>
    </div>
  );
}
