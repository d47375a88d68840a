import type { Metadata } from 'next';
import { Suspense } from 'react';
import { currentActor, hasRole } from '@/lib/auth/actor';
import { parseSearchParams } from '@/lib/catalogue/search-params';
import { searchCurves } from '@/lib/catalogue/search';
import { opticChoices } from '@/lib/catalogue/optic-choices';
import { errorMessage } from '@/lib/catalogue/errors';
import { queryOf, queryString } from '@/lib/catalogue/query-string';
import { CatalogueSearch } from '@/components/catalogue/catalogue-search';

export const metadata: Metadata = { title: 'Catalogue' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

// The first page is answered on the server, so a shared link shows its results at once; SWR takes over from there.
export default async function CurvesPage({ searchParams }: Props) {
  const query = queryOf(await searchParams);
  const key = queryString(query);
  const actor = await currentActor().catch(() => null);
  let initial = null;
  let initialError: string | null = null;
  try {
    initial = await searchCurves(actor, parseSearchParams(new URLSearchParams(key)));
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
