'use client';

import Link from 'next/link';
import { formatDeg } from '@/components/charts/format';
import type { UnitSet } from '@/lib/catalogue/units';

/**
 * The angles a unit was measured at, in its catalogue row: one line when it is a
 * set, opening to a link for each angle's curve. A curve alone shows nothing.
 */
export function UnitSetAngles({ set, title }: { set: UnitSet; title: string }) {
  if (set.curveIds.length < 2) return null;
  const angles = set.aoiDeg.map((a) => formatDeg(a, a % 1 ? 1 : 0)).join(', ');
  return (
    <details className="text-xs" data-testid="unit-set" onClick={(e) => e.stopPropagation()}>
      <summary className="cursor-pointer text-muted hover:text-accent">
        Measured at {set.curveIds.length} angles: <span className="figures text-ink">{angles}</span>
      </summary>
      <ul className="mt-1 flex flex-wrap gap-x-3 gap-y-1" aria-label={`Curves of ${title}, one per angle`}>
        {set.curveIds.map((id, k) => (
          <li key={id}>
            <Link href={`/curves/${id}`} className="figures text-accent underline-offset-4 hover:underline" data-testid="unit-set-curve">
              {formatDeg(set.aoiDeg[k], set.aoiDeg[k] % 1 ? 1 : 0)}: curve {id}
            </Link>
          </li>
        ))}
      </ul>
    </details>
  );
}
