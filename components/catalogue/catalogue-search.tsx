'use client';

import { useCallback, useMemo, useState } from 'react';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import useSWR from 'swr';
import { api, ApiError, getJson } from '@/lib/api-client';
import { formatFNumber, formatRatio, formatDeg } from '@/components/charts/format';
import { DEFAULT_DIR, SORTS, type Sort } from '@/lib/catalogue/search-params';
import { FilterPanel } from './filter-panel';
import { ResultsTable } from './results-table';
import { EmptyState } from './empty-state';
import { CompareTray } from './compare-tray';
import { SolarCaution, ModelCaution } from './solar-caution';
import { SORT_NAMES, SKY_NAMES, lineName, INSTRUMENT_NAMES, bucketLabel } from './labels';
import { queryOf, queryString } from '@/lib/catalogue/query-string';
import { understoodLabel } from './labels';
import type { OpticChoice, Query, SearchResponse } from './types';
import { fieldPointWords, headlineFieldAngle } from '@/lib/optics/headline-field';

type Patch = Record<string, string | undefined>;

/** Per parameter, what a refused search says is wrong with it (shown at the field). */
function fieldErrorsOf(error: unknown): Record<string, string> {
  const fields: Record<string, string> = {};
  if (error instanceof ApiError) for (const d of error.failure.details ?? []) if (d.field && d.message) fields[d.field.split('.')[0]] ??= d.message;
  return fields;
}

const toQuery = (sp: URLSearchParams): Query => queryOf(sp);
const qs = queryString;

/** A chip's words taken out of the search box, spaces tidied. */
function without(q: string, text: string): string | undefined {
  const at = q.indexOf(text);
  const rest = at < 0 ? q : `${q.slice(0, at)} ${q.slice(at + text.length)}`;
  return rest.split(' ').filter(Boolean).join(' ') || undefined;
}

const FILTER_NAMES: Record<string, (v: string) => string> = {
  q: (v) => `“${v}”`,
  line: (v) => lineName(v),
  cwlMin: (v) => `CWL ≥ ${v} nm`,
  cwlMax: (v) => `CWL ≤ ${v} nm`,
  fwhmMin: (v) => `FWHM ≥ ${v} nm`,
  fwhmMax: (v) => `FWHM ≤ ${v} nm`,
  fwhmBucket: (v) => `FWHM ${v.split(',').map(bucketLabel).join(', ')}`,
  peakMin: (v) => `peak ≥ ${Number((Number(v) * 100).toPrecision(4))} %`,
  method: (v) => INSTRUMENT_NAMES[v] ?? v,
  aoiMin: (v) => `AOI ≥ ${v}°`,
  aoiMax: (v) => `AOI ≤ ${v}°`,
  status: (v) => `status: ${v.replace('_', ' ')}`,
  contributor: () => 'one contributor',
  minThroughput: (v) => `keeps ≥ ${Number((Number(v) * 100).toPrecision(4))} % of the line`,
};

export function CatalogueSearch(props: {
  initial: SearchResponse | null;
  initialQuery: string;
  initialError: string | null;
  optics: OpticChoice[];
  isModerator: boolean;
  signedIn: boolean;
}) {
  const router = useRouter();
  const pathname = usePathname();
  const sp = useSearchParams();
  const query = useMemo(() => toQuery(new URLSearchParams(sp.toString())), [sp]);
  const key = qs(query);
  const [text, setText] = useState(query.q ?? '');
  const [lastQ, setLastQ] = useState(query.q ?? '');
  const [filtersOpen, setFiltersOpen] = useState(false);
  if ((query.q ?? '') !== lastQ) {
    // the URL changed underneath (back button, a link): show its words in the box
    setLastQ(query.q ?? '');
    setText(query.q ?? '');
  }

  const { data, error, isLoading, isValidating } = useSWR<SearchResponse, Error>(api.curves.searchUrl(key), getJson<SearchResponse>, {
    keepPreviousData: true,
    fallbackData: key === props.initialQuery && props.initial ? props.initial : undefined,
    revalidateOnFocus: false,
  });
  const shownError = error?.message ?? (key === props.initialQuery ? props.initialError : null);
  // a refused search shows no results (the last ones no longer match what is asked); what is wrong stands at its field
  const fieldErrors = fieldErrorsOf(error);
  const current = shownError ? undefined : data;

  const hrefFor = useCallback(
    (patch: Patch) => {
      const next: Query = { ...query };
      for (const [k, v] of Object.entries(patch)) {
        if (v === undefined || v === '') delete next[k];
        else next[k] = v;
      }
      // any change of what is asked starts again at page 1
      if (!('page' in patch)) delete next.page;
      const s = qs(next);
      return s ? `${pathname}?${s}` : pathname;
    },
    [query, pathname],
  );
  const change = useCallback((patch: Patch) => router.push(hrefFor(patch), { scroll: false }), [router, hrefFor]);

  const sort = (data?.sort ?? query.sort ?? (query.fNumber ? 'throughput' : query.q ? 'relevance' : 'newest')) as Sort;
  const dir = data?.dir ?? query.dir ?? DEFAULT_DIR[sort];
  const onSort = (s: Sort) => {
    if (s === sort) change({ sort: s, dir: dir === 'asc' ? 'desc' : 'asc' });
    else change({ sort: s, dir: undefined });
  };

  const total = current?.total ?? 0;
  const page = data?.page ?? 1;
  const pageSize = data?.pageSize ?? 20;
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const fitness = !!query.fNumber;
  const chips = Object.entries(query).filter(([k]) => k in FILTER_NAMES);
  const showsHa = query.line === 'Ha' || (data?.items ?? []).some((i) => i.lines.includes('Ha'));
  const exportQuery = qs(Object.fromEntries(Object.entries(query).filter(([k]) => !['page', 'pageSize', 'status'].includes(k))));

  return (
    <div className="space-y-4">
      <header className="space-y-3">
        <h1 className="text-2xl font-semibold tracking-tight">Catalogue</h1>
        <form
          role="search"
          className="flex gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            change({ q: text.trim() || undefined, sort: query.sort === 'relevance' && !text.trim() ? undefined : query.sort });
          }}
        >
          <label htmlFor="catalogue-q" className="sr-only">
            Search words
          </label>
          <input
            id="catalogue-q"
            name="q"
            type="search"
            value={text}
            onChange={(e) => setText(e.target.value)}
            placeholder="Words: H-alpha 3nm, a maker, a lab, a coating…"
            className="min-w-0 flex-1 rounded-card border border-rule bg-panel px-3 py-2"
            autoComplete="off"
          />
          <button className="rounded-card bg-accent px-4 py-2 text-accent-ink">Search</button>
        </form>
        {current?.understood?.length ? (
          <ul className="flex flex-wrap gap-2 text-xs" aria-label="Read from the words" data-testid="understood">
            {current.understood.map((u) => (
              <li key={u.text} className={`flex items-center rounded-full border ${u.applied ? 'border-accent/60 bg-accent/10' : 'border-rule bg-panel text-muted'}`}>
                <button
                  type="button"
                  className="py-0.5 pl-2 pr-1"
                  title={u.applied ? 'Edit this in the filters' : 'A filter you set takes its place'}
                  onClick={() => {
                    // editing: the numbers become the search's own parameters, shown in the fields, and leave the words
                    change({ ...Object.fromEntries(Object.entries(u.params).map(([k, v]) => [k, String(v)])), q: without(query.q ?? '', u.text) });
                    setFiltersOpen(true);
                  }}
                  data-testid={`understood-${u.kind}`}
                >
                  {understoodLabel(u)}
                  {u.applied ? '' : ' (not applied)'}
                </button>
                <button type="button" className="py-0.5 pl-1 pr-2" onClick={() => change({ q: without(query.q ?? '', u.text) })} aria-label={`Remove ${understoodLabel(u)}`}>
                  <span aria-hidden="true">×</span>
                </button>
              </li>
            ))}
          </ul>
        ) : null}
        {chips.length > 0 || fitness ? (
          <ul className="flex flex-wrap gap-2 text-xs" aria-label="Active filters">
            {chips.map(([k, v]) => (
              <li key={k}>
                <button type="button" onClick={() => change({ [k]: undefined })} className="rounded-full border border-rule bg-panel px-2 py-0.5 hover:border-accent" aria-label={`Remove filter ${FILTER_NAMES[k](v)}`}>
                  {FILTER_NAMES[k](v)} <span aria-hidden="true">×</span>
                </button>
              </li>
            ))}
            {fitness ? (
              <li>
                <button
                  type="button"
                  onClick={() => change({ fNumber: undefined, obstruction: undefined, nEff: undefined, fieldAngleDeg: undefined, minThroughput: undefined, sort: sort === 'throughput' ? undefined : query.sort })}
                  className="rounded-full border border-accent/60 bg-accent/10 px-2 py-0.5"
                >
                  optic {formatFNumber(Number(query.fNumber))}, obstruction {formatRatio(Number(query.obstruction ?? 0))}
                  , <span data-testid="headline-field">{fieldPointWords(headlineFieldAngle(Number(query.fieldAngleDeg ?? 0)))}</span>
                  {query.nEff ? `, n_eff ${query.nEff}` : ''} <span aria-hidden="true">×</span>
                </button>
              </li>
            ) : null}
            <li>
              <button type="button" onClick={() => router.push(pathname)} className="px-1 py-0.5 text-muted underline-offset-4 hover:underline">
                Clear all
              </button>
            </li>
          </ul>
        ) : null}
      </header>

      <div className="grid gap-6 lg:grid-cols-[17rem_minmax(0,1fr)]">
        <aside aria-label="Filters" className="lg:sticky lg:top-4 lg:self-start">
          <button
            type="button"
            onClick={() => setFiltersOpen((o) => !o)}
            aria-expanded={filtersOpen}
            aria-controls="catalogue-filters"
            className="flex w-full items-center justify-between rounded-card border border-rule bg-panel px-3 py-2 text-sm font-medium lg:hidden"
          >
            Filters{chips.length || fitness ? ` (${chips.length + (fitness ? 1 : 0)} set)` : ''}
            <span aria-hidden="true">{filtersOpen ? '▴' : '▾'}</span>
          </button>
          <div id="catalogue-filters" className={`${filtersOpen ? 'block' : 'hidden'} mt-2 rounded-card border border-rule bg-panel p-3 lg:mt-0 lg:block lg:max-h-[calc(100vh-2rem)] lg:overflow-auto lg:border-0 lg:bg-transparent lg:p-0 lg:pr-2`}>
            <FilterPanel query={query} facets={data?.facets} errors={fieldErrors} optics={props.optics} isModerator={props.isModerator} signedIn={props.signedIn} onChange={change} />
          </div>
        </aside>

        <section aria-label="Results" className="min-w-0 space-y-3">
          <div className="flex flex-wrap items-center gap-x-4 gap-y-2 text-sm">
            <p aria-live="polite" data-testid="result-count">
              {isLoading && !data ? 'Searching…' : shownError ? 'No answer' : <><strong className="figures">{total.toLocaleString('en-US')}</strong> <span title="One row per physical unit: a unit measured at several angles is one row">unit{total === 1 ? '' : 's'}</span></>}
              {isValidating && data ? <span className="ml-2 text-muted">updating…</span> : null}
            </p>
            <label className="flex items-center gap-2">
              <span className="text-muted">Sort</span>
              <select value={sort} onChange={(e) => change({ sort: e.target.value, dir: undefined })} className="rounded-card border border-rule bg-panel px-2 py-1" aria-label="Sort by">
                {SORTS.filter((s) => (s === 'throughput' || s === 'contrast' ? fitness : s === 'relevance' ? !!query.q : true)).map((s) => (
                  <option key={s} value={s}>
                    {SORT_NAMES[s]}
                  </option>
                ))}
              </select>
            </label>
            {sort === 'contrast' ? (
              <label className="flex items-center gap-2">
                <span className="text-muted">Sky</span>
                <select value={query.sky ?? 'suburban'} onChange={(e) => change({ sky: e.target.value })} className="rounded-card border border-rule bg-panel px-2 py-1" aria-label="Sky for the contrast sort" data-testid="contrast-sky">
                  {Object.entries(SKY_NAMES).map(([id, name]) => (
                    <option key={id} value={id}>
                      {name}
                    </option>
                  ))}
                </select>
              </label>
            ) : null}
            <span className="ml-auto flex gap-3 text-sm">
              <span className="text-muted">Download these verified curves:</span>
              <a href={`/api/curves/export.csv${exportQuery ? `?${exportQuery}` : ''}`} className="text-accent underline-offset-4 hover:underline" data-testid="export-csv">CSV</a>
              <a href={`/api/curves/export.json${exportQuery ? `?${exportQuery}` : ''}`} className="text-accent underline-offset-4 hover:underline">JSON</a>
            </span>
          </div>

          {shownError ? (
            <p role="alert" className="rounded-card border border-bad/50 bg-bad/10 px-3 py-2 text-sm text-bad">
              {shownError}
            </p>
          ) : null}

          {current && current.items.length === 0 ? (
            <EmptyState query={query} data={current} onChange={change} hrefFor={hrefFor} />
          ) : current ? (
            <>
              <ResultsTable
                items={current.items}
                sort={sort}
                dir={dir}
                fitness={fitness}
                targetLine={query.line}
                onSort={onSort}
                busy={isValidating}
                odds={
                  current.fitness
                    ? {
                        fNumber: current.fitness.fNumber,
                        obstruction: current.fitness.obstruction,
                        ...(current.fitness.nEff !== null ? { nEff: current.fitness.nEff } : {}),
                        fieldAngleDeg: current.fitness.fieldAngleDeg,
                        minThroughput: query.minThroughput ? Number(query.minThroughput) : 0.8,
                      }
                    : undefined
                }
              />
              <nav aria-label="Pages" className="flex flex-wrap items-center gap-3 text-sm">
                <span className="text-muted">
                  Rows {((page - 1) * pageSize + 1).toLocaleString('en-US')}–{Math.min(total, page * pageSize).toLocaleString('en-US')} of {total.toLocaleString('en-US')}
                </span>
                <button type="button" disabled={page <= 1} onClick={() => change({ page: String(page - 1) })} className="rounded-card border border-rule px-2 py-1 disabled:opacity-40">
                  Previous
                </button>
                <span className="figures">
                  page {page} of {pages}
                </span>
                <button type="button" disabled={page >= pages} onClick={() => change({ page: String(page + 1) })} className="rounded-card border border-rule px-2 py-1 disabled:opacity-40" data-testid="next-page">
                  Next
                </button>
                <label className="ml-auto flex items-center gap-2">
                  <span className="text-muted">Per page</span>
                  <select value={String(pageSize)} onChange={(e) => change({ pageSize: e.target.value })} className="rounded-card border border-rule bg-panel px-2 py-1">
                    {[20, 50, 100].map((n) => (
                      <option key={n}>{n}</option>
                    ))}
                  </select>
                </label>
              </nav>
            </>
          ) : null}

          {fitness ? (
            <p className="text-xs text-muted">
              Line throughput and the speed-equivalent f-number are computed exactly for the rows shown; the filter and the throughput sort read a stored grid
              (see the catalogue notes for its measured accuracy).
            </p>
          ) : null}
          {data?.contrast ? (
            <p className="text-xs text-muted" data-testid="contrast-note">
              Contrast: the background-limited gain (τ/τ_ref)/√(B/B_ref) over an ideal {data.contrast.referenceBoxNm} nm box at the same line, under the
              illustrative “{SKY_NAMES[data.contrast.sky] ?? data.contrast.sky}” sky. {data.contrast.note}
            </p>
          ) : null}
          {fitness ? <ModelCaution /> : null}
          {showsHa ? <SolarCaution compact /> : null}
        </section>
      </div>
      <CompareTray
        optic={
          fitness
            ? {
                fNumber: Number(query.fNumber),
                obstruction: Number(query.obstruction ?? 0),
                fieldAngleDeg: Number(query.fieldAngleDeg ?? 0),
                ...(query.nEff ? { nEff: Number(query.nEff) } : {}),
              }
            : null
        }
      />
    </div>
  );
}
