import type { Metadata } from 'next';
import { Suspense } from 'react';
import { currentActor, hasRole } from '@/lib/auth/actor';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { searchCurves } from '@/lib/catalogue/search';
import { opticChoices } from '@/lib/catalogue/optic-choices';
import { errorMessage } from '@/lib/catalogue/errors';
import { CatalogueSearch } from '@/components/catalogue/catalogue-search';

export const metadata: Metadata = { title: 'Catalogue' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

// The first page is answered on the server, so a shared link shows its results at once; SWR takes over from there.
export default async function CurvesPage({ searchParams }: Props) {
  const raw = await searchParams;
  const flat: Record<string, string> = {};
  for (const [k, v] of Object.entries(raw)) {
    const one = Array.isArray(v) ? v[v.length - 1] : v;
    if (typeof one === 'string' && one !== '') flat[k] = one;
  }
  const key = new URLSearchParams(Object.entries(flat).sort(([a], [b]) => a.localeCompare(b))).toString();
  const actor = await currentActor().catch(() => null);
  let initial = null;
  let initialError: string | null = null;
  try {
    initial = await searchCurves(actor, parseSearchParams(flat));
  } catch (err) {
    initialError = errorMessage(err);
  }
  const optics = await opticChoices(actor);
  return (
    <Suspense>
      <CatalogueSearch
        initial={initial ? JSON.parse(JSON.stringify(initial)) : null}
        initialQuery={key}
        initialError={initialError}
        optics={optics}
        isModerator={hasRole(actor, 'moderator')}
        signedIn={!!actor}
      />
    </Suspense>
  );
}
