'use client';

import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useCallback, useEffect, useMemo, useState, useTransition } from 'react';
import { downloadText } from '@/components/charts/csv';
import { formatFNumber, formatRatio, formatSignedNm, fixed } from '@/components/charts/format';
import { useChartTheme } from '@/components/charts/use-chart-theme';
import { findLine } from '@/lib/engine/lines';
import type { StudyResults } from '@/lib/study/compute';
import { studyCsv } from '@/lib/study/tables';
import { curvesFromFragment, pastedFragment } from '@/lib/study/pasted-link';
import type { StudyCurve } from '@/lib/study/types';
import { fallbackLineFor, resolveSettings, studySearch, type QueryField, type StudyQuery } from '@/lib/study/url-state';
import { StudyCautions } from './cautions';
import { ComparisonTable } from './comparison-table';
import { StudyCharts } from './study-charts';
import { SensorMap } from './sensor-map';
import { SkyPanel } from './sky-panel';
import { StudyInputs, type OpticOption } from './study-inputs';
import { useStudyCompute } from './use-study-compute';
import { VerdictCard } from './verdict-card';
import { formatCurveId } from '@/lib/labels';

export interface StudyWorkbenchProps {
  initialQuery: StudyQuery;
  catalogueCurves: StudyCurve[];
  missing: number[];
  optics: OpticOption[];
  signedIn: boolean;
  initialResults: StudyResults;
}

/** How long typing must pause before the address bar follows. */
const URL_DEBOUNCE_MS = 300;

export function StudyWorkbench(props: StudyWorkbenchProps) {
  const router = useRouter();
  const [query, setQuery] = useState(props.initialQuery);
  const [pasted, setPasted] = useState<StudyCurve[]>([]);
  const [linkProblem, setLinkProblem] = useState<string | null>(null);
  // Pasted curves that came in the link (after the #, which the server never sees); read once, in the browser.
  useEffect(() => {
    curvesFromFragment(window.location.hash)
      .then((cs) => {
        if (cs.length) setPasted((p) => [...p, ...cs.filter((c) => !p.some((x) => x.key === c.key))]);
      })
      .catch((e: Error) => setLinkProblem(e.message));
  }, []);
  const [settingsOpen, setSettingsOpen] = useState(false);
  const [navigating, startNavigation] = useTransition();
  const theme = useChartTheme();

  // Catalogue curves in the order the reader chose them, then pasted ones.
  const curves = useMemo(() => {
    const byId = new Map(props.catalogueCurves.map((c) => [c.id, c]));
    const fromCatalogue = query.curveIds.flatMap((id) => (byId.has(id) ? [byId.get(id)!] : []));
    return [...fromCatalogue, ...pasted];
  }, [props.catalogueCurves, query.curveIds, pasted]);

  const resolved = useMemo(() => resolveSettings(query, props.optics, fallbackLineFor(curves)), [query, props.optics, curves]);
  // While a typed value is out of range the study keeps its last good numbers instead of jumping to a default.
  const typing = Object.keys(resolved.errors).some((k) => k !== 'optic');
  const [lastGood, setLastGood] = useState(resolved.settings);
  // Adjusting state while rendering (React's pattern for deriving from a changed input), guarded so it settles.
  if (!typing && lastGood !== resolved.settings) setLastGood(resolved.settings);
  const settings = typing ? lastGood : resolved.settings;
  const { results, computedFor, busy, error } = useStudyCompute(curves, settings, props.initialResults);

  useEffect(() => {
    // A pending navigation (new curves) writes the address itself; touching history now would cancel it.
    if (navigating) return;
    const search = studySearch(query);
    const timer = setTimeout(() => {
      const next = `${window.location.pathname}${search ? `?${search}` : ''}`;
      if (next !== `${window.location.pathname}${window.location.search}`) window.history.replaceState(null, '', next);
    }, URL_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [query, navigating]);

  const setField = useCallback((field: QueryField, value: string) => setQuery((q) => ({ ...q, [field]: value })), []);
  const update = useCallback((patch: Partial<StudyQuery>) => setQuery((q) => ({ ...q, ...patch })), []);

  // A new catalogue curve needs its points from the server: navigate, keeping every other setting.
  const setCurveIds = useCallback(
    (ids: number[]) => {
      const next = { ...query, curveIds: ids };
      setQuery(next);
      const search = studySearch(next);
      startNavigation(() => router.replace(`/study${search ? `?${search}` : ''}`, { scroll: false }));
    },
    [query, router],
  );

  const studies = results.outcomes.flatMap((o) => (o.ok ? [o.study] : []));
  const failures = results.outcomes.filter((o) => !o.ok) as Extract<(typeof results.outcomes)[number], { ok: false }>[];
  const colours = curves.map((_, i) => theme.series(i).color);
  const colourOf = (key: string) => colours[curves.findIndex((c) => c.key === key)] ?? theme.series(0).color;

  const s = settings;
  const lineId = 'id' in s.line ? s.line.id : null;
  // On axis, like the verdict's headline number.
  const suitsLink = lineId
    ? `/curves?${new URLSearchParams({
        line: lineId,
        fNumber: String(s.optic.fNumber),
        obstruction: String(s.optic.obstruction),
        ...(s.nEff != null ? { nEff: String(s.nEff) } : {}),
        minThroughput: '0.8',
      }).toString()}`
    : null;

  const [copied, setCopied] = useState(false);
  async function copyLink() {
    const search = studySearch(query);
    const url = `${window.location.origin}/study${search ? `?${search}` : ''}${await pastedFragment(curves)}`;
    try {
      await navigator.clipboard.writeText(url);
      setCopied(true);
      setTimeout(() => setCopied(false), 1600);
    } catch {
      window.prompt('Copy this link', url);
    }
  }

  const lineName = lineId ? (findLine(lineId)?.name ?? lineId) : 'nm' in s.line ? `${fixed(s.line.nm, 2)} nm` : '';
  const summary = `${s.optic.name === 'Typed optic' ? 'Typed optic' : s.optic.name}: ${formatFNumber(s.optic.fNumber)}, ${formatRatio(s.optic.obstruction)} obstruction · ${lineName} · pre-shift ${formatSignedNm(s.preShiftNm)}`;
  const stale = busy || navigating;

  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <p className="text-xs font-semibold uppercase tracking-wider text-accent">Cone study</p>
        <h1 className="text-2xl font-semibold tracking-tight sm:text-3xl">What reaches the sensor through your optic</h1>
        <p className="max-w-3xl leading-relaxed text-muted">
          A measured curve run through the light cone of an optic: how much of the line survives, how the passband moves and widens, and which pre-shift or
          bandwidth would do better. Everything below recomputes as you type, and the address bar always holds a link to this exact study.
        </p>
      </header>

      <div className="grid grid-cols-[minmax(0,1fr)] items-start gap-6 lg:grid-cols-[21rem_minmax(0,1fr)]">
        <div className="space-y-3 lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)] lg:overflow-y-auto lg:pr-1">
          <button
            type="button"
            className="flex w-full items-center justify-between gap-3 rounded-card border border-rule bg-panel px-4 py-3 text-left text-sm lg:hidden"
            aria-expanded={settingsOpen}
            aria-controls="study-settings"
            onClick={() => setSettingsOpen((o) => !o)}
          >
            <span className="min-w-0">
              <span className="block text-xs font-semibold uppercase tracking-wider text-muted">Study settings</span>
              <span className="figures block truncate">{summary}</span>
            </span>
            <span className="shrink-0 text-accent">{settingsOpen ? 'Close' : 'Change'}</span>
          </button>
          <div id="study-settings" className={settingsOpen ? 'block' : 'hidden lg:block'}>
            <StudyInputs
              query={query}
              setField={setField}
              update={update}
              curves={curves}
              loadingCurves={navigating}
              onAddCatalogue={(id) => setCurveIds([...query.curveIds, id])}
              onAddPasted={(c) => setPasted((p) => [...p, c])}
              onRemove={(c) => (c.id != null ? setCurveIds(query.curveIds.filter((id) => id !== c.id)) : setPasted((p) => p.filter((x) => x.key !== c.key)))}
              optics={props.optics}
              resolved={resolved}
              outcomes={results.outcomes}
              signedIn={props.signedIn}
              colours={colours}
            />
          </div>
        </div>

        <div className="min-w-0 space-y-6">
          {linkProblem ? (
            <p role="alert" className="rounded-card border border-bad bg-panel px-3 py-2 text-sm text-bad" data-testid="link-problem">
              {linkProblem}
            </p>
          ) : null}
          <div className="flex flex-wrap items-center gap-2 rounded-card border border-rule bg-panel px-3 py-2 text-sm" role="group" aria-label="Study actions">
            <span className="flex min-w-0 items-center gap-2" role="status" aria-live="polite" data-testid="study-status" data-busy={stale || undefined}>
              <span aria-hidden="true" className={`h-2 w-2 shrink-0 rounded-full ${stale ? 'animate-pulse bg-wait' : 'bg-ok'}`} />
              <span className="text-muted">
                {stale ? 'Recomputing…' : `Computed in ${Math.max(1, Math.round(results.elapsedMs))} ms`}
              </span>
            </span>
            <span className="ml-auto flex flex-wrap gap-2">
              <button type="button" onClick={copyLink} className="rounded-card border border-rule px-2.5 py-1 text-xs hover:border-accent hover:text-accent">
                {copied ? 'Link copied' : 'Copy link to this study'}
              </button>
              <button
                type="button"
                onClick={() => downloadText('cone-study.csv', studyCsv(results, computedFor))}
                className="rounded-card border border-rule px-2.5 py-1 text-xs hover:border-accent hover:text-accent"
              >
                Download all tables (CSV)
              </button>
              {suitsLink ? (
                <Link href={suitsLink} className="rounded-card bg-accent px-2.5 py-1 text-xs text-accent-ink" data-testid="suits-link">
                  Which curves suit this optic?
                </Link>
              ) : null}
            </span>
          </div>

          {props.missing.length ? (
            <p role="alert" className="rounded-card border border-bad px-3 py-2 text-sm text-bad">
              {props.missing.map((id) => formatCurveId(id)).join(', ')}: not in the catalogue, or not visible to you.
            </p>
          ) : null}
          {error ? (
            <p role="alert" className="rounded-card border border-bad px-3 py-2 text-sm text-bad">
              The study could not be computed: {error}
            </p>
          ) : null}
          {failures.map((f) => (
            <p key={f.curve.key} role="alert" className="rounded-card border border-bad px-3 py-2 text-sm text-bad">
              {f.curve.label}: {f.error}
            </p>
          ))}

          {studies.length > 1 ? (
            <div className={`transition-opacity ${stale ? 'opacity-70' : ''}`}>
              <ComparisonTable studies={studies} colourOf={colourOf} />
            </div>
          ) : null}
          {studies.length ? (
            <section aria-label="Verdicts" className={`grid gap-4 ${studies.length > 1 ? 'xl:grid-cols-2' : ''} transition-opacity ${stale ? 'opacity-70' : ''}`}>
              {studies.map((st) => (
                <VerdictCard key={st.curve.key} study={st} settings={computedFor} colour={colourOf(st.curve.key)} />
              ))}
            </section>
          ) : (
            <section className="rounded-card border border-dashed border-rule bg-panel px-4 py-6 text-sm">
              <h2 className="font-semibold">Choose a curve to study</h2>
              <p className="mt-1 text-muted">
                Search the catalogue in the settings, paste your own data, or start from any curve page. The angle picture and the bandwidth explorer below already
                describe this optic on their own.
              </p>
            </section>
          )}

          <StudyCautions />

          <div className={`transition-opacity ${stale ? 'opacity-70' : ''}`}>
            <StudyCharts results={results} settings={computedFor} studies={studies} />
          </div>
          {studies.length ? <SensorMap studies={studies} settings={computedFor} /> : null}
          {studies.length ? <SkyPanel studies={studies} settings={computedFor} /> : null}
        </div>
      </div>
    </div>
  );
}
