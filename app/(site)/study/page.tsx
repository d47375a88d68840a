import type { Metadata } from 'next';
import { currentActor } from '@/lib/auth/actor';
import { computeStudy } from '@/lib/study/compute';
import { fallbackLineFor, parseStudyQuery, resolveSettings } from '@/lib/study/url-state';
import { StudyWorkbench } from '@/components/study/study-workbench';
import { getStudyView } from '@/lib/study/load';

export const metadata: Metadata = { title: 'Cone study' };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

// Public: visitors run the cone model on verified curves with the example optics.
export default async function StudyPage({ searchParams }: Props) {
  const query = parseStudyQuery(await searchParams);
  const actor = await currentActor().catch(() => null);
  const { optics, ...loaded } = await getStudyView(actor, query.curveIds);
  // The first paint already carries the numbers: the same computation the browser repeats on every change.
  const { settings } = resolveSettings(query, optics, fallbackLineFor(loaded.curves));
  const results = computeStudy(loaded.curves, settings);
  return (
    <StudyWorkbench
      initialQuery={query}
      catalogueCurves={loaded.curves}
      missing={loaded.missing}
      optics={optics}
      signedIn={!!actor}
      initialResults={results}
    />
  );
}
