/**
 * GET /api/curves: full text, parametric filters, facet counts and the fitness
 * filter, answered by PostgreSQL in two queries (one page, one for the total and
 * the facets), then the page's throughputs recomputed exactly by the engine.
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { searchableCurvesSql, searchWithinPublic } from '@/lib/auth/policy';
import { lineThroughput } from '@/lib/engine/cone';
import { wavelengthUncertaintyOf } from '@/lib/engine/quality';
import { prepareCurve } from '@/lib/engine/curve';
import { findLine } from '@/lib/engine/lines';
import { buildPupil, type Pupil } from '@/lib/engine/pupil';
import { defaultNEff, fineSliceSql, fitnessSql, fitnessWeights, frameSql, offNormalThroughput, opticOf, type FitnessQuery, type Weights } from './fitness-grid';
import { DEFAULT_DIR, DEFAULT_PAGE_SIZE, FWHM_BUCKETS, bucketKey, hasFitness, type SearchParams, type Sort } from './search-params';
import { activeFilters, bucketIndex, FWHM_BUCKET_SQL, SORT_COLUMNS, nullsFirst, type FacetName, type Filter } from './filters';
import { readSearchWords, type Understood } from './read-query';
import { nearestAnswers, type Nearest } from './nearest';
import { and, MARK_END, MARK_START, snippetHtml, SqlParts } from './sql';
import { sparklineOf } from './sparkline';
import { cachedAnswer, cachedCounts } from './count-cache';
import { binaryArraySql, readFloat8Array } from './binary-array';
import { curvePointsByIds } from './points';
import { answeredInMemory, searchInMemory, type CountGroup } from './memory-search';
import { currentVersion } from './memory-index';
import { copyServes, readCatalogue } from './read-source';
import { normalCwlNm, unitLeadSql, unitSetsOf, type UnitSet } from './units';
import { byContrast, contrastOf, CONTRAST_CANDIDATES, CONTRAST_REFERENCE_BOX_NM, DEFAULT_CONTRAST_SKY } from './contrast';

export interface SearchItem {
  id: number;
  title: string;
  label: string;
  maker: string | null;
  lines: string[];
  /** CWL at normal incidence (units.ts), what the CWL filter and order use. */
  cwlNm: number | null;
  /** CWL as measured, at `aoiDeg`. */
  measuredCwlNm: number | null;
  fwhmNm: number | null;
  peakT: number;
  status: string;
  instrument: string;
  aoiDeg: number;
  /** The unit's curve set: every angle it was measured at and the curve of each (one row stands for the unit). */
  set: UnitSet;
  verifiedAt: string | null;
  throughput?: number;
  /** Throughput at ∓ the curve's wavelength-scale uncertainty (declared, else its instrument's default). */
  throughputRange?: [number, number];
  speedEquivalentFNumber?: number | null;
  /** Contrast gain over an ideal 10 nm box under the search's sky (sort=contrast only). */
  skyGain?: number | null;
  snippet?: string;
  sparkline: { wavelengthNm: number[]; transmission: number[] };
}

export interface FacetCount {
  key: string;
  count: number;
}

export interface SearchResult {
  items: SearchItem[];
  total: number;
  page: number;
  pageSize: number;
  sort: Sort;
  dir: 'asc' | 'desc';
  facets: { line: FacetCount[]; method: FacetCount[]; fwhm: FacetCount[] };
  fitness?: { lineId: string | null; fNumber: number; obstruction: number; nEff: number | null; fieldAngleDeg: number; gridLevel: number };
  /** How the contrast sort was answered (sort=contrast only). */
  contrast?: { sky: string; referenceBoxNm: number; candidates: number; note: string };
  /** With `q`: the filters read from its words (read-query.ts) and the words left for the full-text search. */
  understood?: Understood[];
  words?: string;
  /** When nothing matches: the nearest answers, with the number of curves each finds. */
  nearest?: Nearest;
}

/** Integer arrays (the fine level) come back as text and are split here: several times quicker than the driver's array parser. */
function numbers(text: string): number[] {
  return text.split(',').map(Number);
}

/** Relevance ranks at most this many matches, the newest (see buildSearchSql). */
export const RANK_CANDIDATES = 2000;

/** Exact τ computed per curve when the grid cannot answer (off-normal curves under a named n_eff; curves without grid rows yet). */
const MAX_EXACT = 5000;

function visibility(actor: Actor | null, p: SearchParams, s: SqlParts): string {
  return searchableCurvesSql(actor, p.status, (v, cast) => s.param(v, cast));
}

/** One row of the filter table (filters.ts) as SQL. */
function filterSql(f: Filter, p: SearchParams, s: SqlParts): string {
  switch (f.operator) {
    case '>=':
    case '<=':
      return `${f.column} ${f.operator} ${s.param(p[f.param])}`;
    case '=':
      return `${f.column} = ${s.param(p[f.param], 'cast' in f ? f.cast : '')}`;
    // = ANY reads the covering index far faster than @> (which would reach the GIN on lines)
    case 'has':
      return `${s.param(p[f.param])}::text = ANY(${f.column})`;
    case 'bucket-in':
      return `${FWHM_BUCKET_SQL} = ANY(${s.param((p.fwhmBucket ?? []).map(bucketIndex), '::int[]')})`;
  }
}

interface Built {
  s: SqlParts;
  /** Every filter except line, method and FWHM, which the facets leave out in turn. */
  common: string[];
  line: string | null;
  method: string | null;
  fwhm: string | null;
  joins: string;
  tau: string | null;
  rank: string | null;
  query: string | null;
}

/** What is decided once per search, before any SQL is written. */
export interface Plan {
  actor: Actor | null;
  p: SearchParams;
  weights?: Weights;
  pupil?: Pupil;
  exact?: { ids: number[]; taus: number[] };
}

/**
 * The clauses for one statement. Each statement gets its own SqlParts because
 * PostgreSQL refuses a bind parameter that the statement never uses.
 */
function clauses(plan: Plan, s: SqlParts, withFitness = true, omit: ('line' | 'method' | 'fwhm')[] = []): Built {
  const { p, actor } = plan;
  // one row per unit: a set's other curves are left out of the rows, the counts and the facets (units.ts)
  const common: string[] = [visibility(actor, p, s), unitLeadSql('c')];
  let query: string | null = null;
  let rank: string | null = null;
  if (p.q) {
    query = `websearch_to_tsquery('english', ${s.param(p.q)})`;
    common.push(`c.search @@ ${query}`);
    rank = `ts_rank_cd(c.search, ${query})`;
  }
  const byFacet: Record<FacetName, string[]> = { line: [], method: [], fwhm: [] };
  for (const f of activeFilters(p)) {
    if (f.facet && omit.includes(f.facet)) continue;
    const sql = filterSql(f, p, s);
    (f.facet ? byFacet[f.facet] : common).push(sql);
  }
  const part = (facet: FacetName) => (byFacet[facet].length ? and(byFacet[facet]) : null);
  const [line, method, fwhm] = [part('line'), part('method'), part('fwhm')];

  let joins = '';
  let tau: string | null = null;
  if (withFitness && plan.weights) {
    // τ for every stored row of the target line at the search's level, computed once per row
    // (OFFSET 0 keeps PostgreSQL from copying the sum into each place that reads it), filtered
    // there when a minimum is asked for, and joined to the curves by id
    const w = plan.weights;
    const sum = fitnessSql(w, frameSql(w, 'f'));
    const lineCond = p.line ? ` AND f.line_id = ${s.param(p.line)}` : ' AND f.primary_line';
    const exact = plan.exact && plan.exact.ids.length > 0;
    const min = p.minThroughput !== undefined && !exact ? ` WHERE g.tau >= ${s.param(p.minThroughput)}` : '';
    joins +=
      ` LEFT JOIN (SELECT g.curve_id, g.line_id, g.tau FROM (SELECT f.curve_id, f.line_id, ${sum} AS tau FROM curve_fitness f` +
      ` WHERE f.level = ${w.level}${lineCond} OFFSET 0) g${min}) t ON t.curve_id = c.id`;
    if (exact) {
      joins += ` LEFT JOIN unnest(${s.param(plan.exact!.ids, '::int[]')}, ${s.param(plan.exact!.taus, '::float8[]')}) AS x(id, tau) ON x.id = c.id`;
      tau = 'coalesce(x.tau, t.tau)';
    } else {
      tau = 't.tau';
    }
    if (p.minThroughput !== undefined) common.push(`${tau} >= ${s.param(p.minThroughput)}`);
  }
  return { s, common, line, method, fwhm, joins, tau, rank, query };
}

async function plan(actor: Actor | null, p: SearchParams, inSql = true): Promise<Plan> {
  const out: Plan = { actor, p };
  if (hasFitness(p)) {
    const fq: FitnessQuery = { fNumber: p.fNumber, obstruction: p.obstruction ?? 0, nEff: p.nEff, fieldAngleDeg: p.fieldAngleDeg };
    out.pupil = buildPupil(opticOf(fq));
    out.weights = fitnessWeights(fq, out.pupil);
    if (inSql) out.exact = await exactWhereGridCannot(out, fq);
  }
  return out;
}

/**
 * The grid stores off-normal curves brought to normal incidence with their own
 * n_eff, and has no rows for curves that are not verified yet; for those few a
 * search computes τ with the engine and hands the values to the query.
 */
async function exactWhereGridCannot(plan: Plan, fq: FitnessQuery) {
  const { p } = plan;
  type Row = { id: number; lines: string[]; aoi_deg: number; n_eff: number | null; fine: string | null; first: number | null; wl: Buffer | null; tr: Buffer | null };
  // off-normal curves read only the stretch of their fine level this optic reaches
  const slice = fineSliceSql(fq.nEff ?? 2, plan.pupil!, 'c.aoi_deg');
  // the line is written into the SQL as a checked id (LINE_IDS), so both statements can share it
  const target = () => (p.line ? `'${p.line}'` : 'c.lines[1]');
  const load = async (extra: string) => {
    const b = clauses(plan, new SqlParts(), false, ['method', 'fwhm']);
    return db().sequelize.query<Row>(
      `SELECT c.id, c.lines, c.aoi_deg, c.n_eff, ${slice.first} AS first,
              array_to_string(g.fine[${slice.first} + 1 : ${slice.last} + 1], ',') AS fine,
              CASE WHEN g.fine IS NULL THEN ${binaryArraySql('c.wavelength_nm')} END AS wl,
              CASE WHEN g.fine IS NULL THEN ${binaryArraySql('c.transmission')} END AS tr
       FROM curves c LEFT JOIN curve_fitness_fine g ON g.curve_id = c.id AND g.line_id = ${target()}
       WHERE ${and([...b.common, b.line, extra])} ORDER BY c.id LIMIT ${MAX_EXACT}`,
      { bind: b.s.bind, type: QueryTypes.SELECT },
    );
  };
  const rows: Row[] = [];
  // method and FWHM are left out: the facet counts, which drop those filters in turn, need the same τ
  // every verified curve has its grid (written when it was verified); only signed-in readers see others
  if (searchWithinPublic(plan.actor, p.status) !== 'yes') rows.push(...(await load(`c.status IN ('submitted', 'changes_requested', 'rejected', 'superseded') AND NOT EXISTS (SELECT 1 FROM curve_fitness h WHERE h.line_id = ${target()} AND h.level = 0 AND h.curve_id = c.id)`)));
  if (p.nEff !== undefined) rows.push(...(await load(`c.aoi_deg > 0 AND c.status = 'verified'`)));
  const ids: number[] = [];
  const taus: number[] = [];
  for (const r of rows) {
    const lineId = p.line ?? r.lines[0];
    const l = lineId ? findLine(lineId) : undefined;
    if (!l || ids.includes(r.id)) continue;
    const nEff = fq.nEff ?? defaultNEff(r.n_eff);
    const t =
      r.fine && fq.nEff !== undefined && r.aoi_deg > 0
        ? offNormalThroughput(numbers(r.fine), r.aoi_deg, nEff, plan.pupil!, r.first ?? 0)
        : r.wl && r.tr
          ? lineThroughput({ wavelengthNm: readFloat8Array(r.wl), transmission: readFloat8Array(r.tr) }, plan.pupil!, l.airNm, { nEff, measuredAoiDeg: r.aoi_deg }).throughput
          : null;
    if (t === null) continue;
    ids.push(r.id);
    taus.push(t);
  }
  return { ids, taus };
}

function orderBy(sort: Sort, dir: 'asc' | 'desc', b: Built): string {
  const d = dir === 'asc' ? 'ASC' : 'DESC';
  const tie = `c.id ${d}`;
  const by = (key: Sort) => {
    const c = SORT_COLUMNS[key]!;
    // 'index' writes no NULLS clause, so the order matches an index (or its backward scan) and the first page needs no sort
    const nulls = c.nulls === 'index' ? '' : nullsFirst(c.nulls, dir) ? ' NULLS FIRST' : ' NULLS LAST';
    return `${c.column} ${d}${nulls}, ${tie}`;
  };
  switch (sort) {
    case 'relevance':
      return b.rank ? `${b.rank} ${d}, c.verified_at DESC NULLS LAST, c.id DESC` : by('newest');
    case 'throughput':
    // exports of a contrast search keep the throughput order of its candidates (contrast.ts)
    case 'contrast':
      return `${b.tau} ${d} NULLS LAST, ${tie}`;
    default:
      return by(sort);
  }
}

type PageRow = {
  id: number; label: string; maker: string | null; lines: string[]; cwl_nm: number | null; fwhm_nm: number | null; peak_t: number;
  status: string; instrument: string; aoi_deg: number; serial: string | null; verified_at: Date | null; n_eff: number | null;
  tau: number | null; snippet: string | null; spark_w: number[] | null; spark_t: number[] | null;
};

function titleOf(r: Pick<PageRow, 'label' | 'serial' | 'aoi_deg'>): string {
  const parts = [r.serial ? `unit ${r.serial}` : null, r.aoi_deg > 0 ? `measured at ${r.aoi_deg}° AOI` : null].filter(Boolean);
  return parts.length ? `${r.label} (${parts.join(', ')})` : r.label;
}

/** The columns of a result row, for both ways of answering. */
const PAGE_COLUMNS = `c.id, c.label, c.maker, c.lines, c.cwl_nm, c.fwhm_nm, c.peak_t, c.status, c.instrument, c.aoi_deg, c.serial,
           c.verified_at, c.n_eff`;

export interface SearchSql {
  plan: Plan;
  sort: Sort;
  dir: 'asc' | 'desc';
  page: number;
  pageSize: number;
  pageSql: string;
  pageBind: unknown[];
  facetSql: string;
  facetBind: unknown[];
}

/** The order and page a search asks for, with their defaults. */
function ordering(p: SearchParams) {
  // with an optic, line throughput is what the reader came for (unless they chose an order)
  const sort: Sort = p.sort ?? (hasFitness(p) ? 'throughput' : p.q ? 'relevance' : 'newest');
  return { sort, dir: p.dir ?? DEFAULT_DIR[sort], page: p.page ?? 1, pageSize: p.pageSize ?? DEFAULT_PAGE_SIZE };
}

/** The two statements of a search (exported so a test can EXPLAIN exactly what runs). */
export async function buildSearchSql(actor: Actor | null, p: SearchParams): Promise<SearchSql> {
  const { sort, dir, page, pageSize } = ordering(p);
  const pl = await plan(actor, p);

  // the page: ids in order first, then the costly columns (headline, sparkline) for those rows only
  const b = clauses(pl, new SqlParts());
  const ps = b.s;
  const where = and([...b.common, b.line, b.method, b.fwhm]);
  const headline = b.query
    ? `ts_headline('english', concat_ws(' · ', c.notes, c.lab, c.serial), ${b.query}, ${ps.param(`StartSel=${MARK_START}, StopSel=${MARK_END}, MaxWords=24, MinWords=8, MaxFragments=2, FragmentDelimiter=" … "`)})`
    : 'NULL';
  // Relevance orders the RANK_CANDIDATES newest matches (or as many as the page needs): a word shared by
  // a third of the library would otherwise sort tens of thousands. The rank is taken while each match is
  // read anyway, so the sort that picks the newest carries narrow rows, never the tsvectors.
  const ranked = sort === 'relevance' && b.rank;
  const candidates = Math.max(RANK_CANDIDATES, page * pageSize);
  const source = ranked
    ? `(SELECT c.id, c.verified_at, ${b.rank} AS rank, ${b.tau ?? 'NULL::float8'} AS tau FROM curves c ${b.joins} WHERE ${where}
        ORDER BY c.verified_at DESC NULLS LAST, c.id DESC LIMIT ${candidates}) c`
    : `curves c ${b.joins} WHERE ${where}`;
  const pageSql = `
    WITH hit AS (
      SELECT h.id, h.tau, row_number() OVER () AS ord
      FROM (SELECT c.id, ${ranked ? 'c.tau' : (b.tau ?? 'NULL::float8')} AS tau FROM ${source}
            ORDER BY ${orderBy(sort, dir, ranked ? { ...b, rank: 'c.rank' } : b)} LIMIT ${ps.param(pageSize)} OFFSET ${ps.param((page - 1) * pageSize)}) h
    )
    SELECT ${PAGE_COLUMNS}, hit.tau, ${headline} AS snippet, sp.wavelength_nm AS spark_w, sp.transmission AS spark_t
    FROM hit JOIN curves c ON c.id = hit.id LEFT JOIN curve_sparklines sp ON sp.curve_id = c.id
    ORDER BY hit.ord`;

  // The total and every facet from one scan: rows grouped by what the facets look at (instrument,
  // FWHM bucket, the lines array, whether the FWHM filter holds), a few dozen groups at most;
  // the counts, each facet leaving out its own filter, are added up from the groups.
  const fb = clauses(pl, new SqlParts(), true, ['line', 'method']);
  const facetSql = `
    SELECT c.instrument, CASE WHEN c.fwhm_nm IS NULL THEN NULL ELSE ${FWHM_BUCKET_SQL} END AS bucket, c.lines,
           coalesce(${fb.fwhm ?? 'true'}, false) AS pf, count(*) AS n
    FROM curves c ${fb.joins} WHERE ${and(fb.common)}
    GROUP BY 1, 2, 3, 4`;
  return { plan: pl, sort, dir, page, pageSize, pageSql, pageBind: ps.bind, facetSql, facetBind: fb.s.bind };
}

function countGroups(sql: string, bind: unknown[]): Promise<CountGroup[]> {
  return db().sequelize.query<CountGroup>(sql, { bind, type: QueryTypes.SELECT });
}

/** Facet counts from the grouped rows: each facet leaves out its own filter. */
function tallyFacets(p: SearchParams, groups: CountGroup[]) {
  const facets: SearchResult['facets'] = { line: [], method: [], fwhm: [] };
  const line = new Map<string, number>();
  const method = new Map<string, number>();
  const fwhm = new Map<number, number>();
  let total = 0;
  for (const g of groups) {
    const n = Number(g.n);
    const pl = !p.line || g.lines.includes(p.line);
    const pm = !p.method || g.instrument === p.method;
    if (pl && pm && g.pf) total += n;
    if (pl && g.pf) method.set(g.instrument, (method.get(g.instrument) ?? 0) + n);
    if (pl && pm && g.bucket !== null) fwhm.set(Number(g.bucket), (fwhm.get(Number(g.bucket)) ?? 0) + n);
    if (pm && g.pf) for (const l of new Set(g.lines)) line.set(l, (line.get(l) ?? 0) + n);
  }
  for (const [key, count] of line) facets.line.push({ key, count });
  for (const [key, count] of method) facets.method.push({ key, count });
  for (const [b, count] of fwhm) facets.fwhm.push({ key: bucketKey(FWHM_BUCKETS[b]), count });
  return { total, facets };
}

export interface SearchOptions {
  /** false runs every search in SQL (tests compare the two ways of answering). */
  memory?: boolean;
}

/**
 * A search as the API answers it: the words of `q` read into filters first (read-query.ts), and, when
 * nothing matches, the nearest answers with true counts (nearest.ts). On the read replica when one
 * serves (read-source.ts).
 */
export function searchCurves(actor: Actor | null, p: SearchParams, options: SearchOptions = {}): Promise<SearchResult> {
  return readCatalogue(async () => {
    if (actor) return answer(actor, p, options);
    // a signed-out visitor's answer is the public catalogue's, the same for everyone: kept under its version
    const version = await currentVersion();
    return cachedAnswer(`${version}\n${options.memory ?? ''}\n${JSON.stringify(p)}`, () => answer(null, p, { ...options, version }));
  });
}

/** How one search runs: the caller's options, and the catalogue version when it has been read already (a signed-out visitor's). */
type RunOptions = SearchOptions & { version?: string };

async function answer(actor: Actor | null, p: SearchParams, options: RunOptions): Promise<SearchResult> {
  const read = readSearchWords(p);
  const result = await runSearch(actor, read.params, options);
  const out: SearchResult = p.q ? { ...result, understood: read.understood, words: read.words } : result;
  if (result.total === 0) out.nearest = await nearestAnswers(read, p.q, (relaxed) => runSearch(actor, relaxed, options));
  return out;
}

async function runSearch(actor: Actor | null, p: SearchParams, options: RunOptions): Promise<SearchResult> {
  if (p.sort === 'contrast' && hasFitness(p)) return searchByContrast(actor, p, options);
  if (options.memory !== false && hasFitness(p) && copyServes() && (await answeredInMemory(actor, p))) {
    const fromCopy = await searchCopy(actor, p);
    if (fromCopy) return fromCopy;
  }
  const { plan: pl, sort, dir, page, pageSize, pageSql, pageBind, facetSql, facetBind } = await buildSearchSql(actor, p);
  const { sequelize } = db();
  const [rows, groups] = await Promise.all([
    sequelize.query<PageRow>(pageSql, { bind: pageBind, type: QueryTypes.SELECT }),
    // only the public catalogue's counts are kept, under its version: any verification in any
    // process or app server moves the version, so a kept count never outlives the catalogue it counted
    actor
      ? countGroups(facetSql, facetBind)
      : (options.version !== undefined ? Promise.resolve(options.version) : currentVersion()).then((v) =>
          cachedCounts(`${v}\n${facetSql}\n${JSON.stringify(facetBind)}`, () => countGroups(facetSql, facetBind)),
        ),
  ]);
  return assemble(p, pl, { sort, dir, page, pageSize }, rows, groups);
}

/**
 * Sort by contrast (contrast.ts): the CONTRAST_CANDIDATES matches of highest line
 * throughput, each given its exact contrast gain, ordered and paged. The facets
 * and total are those of the whole search.
 */
async function searchByContrast(actor: Actor | null, p: SearchParams & { fNumber: number }, options: RunOptions): Promise<SearchResult> {
  const pageSize = p.pageSize ?? DEFAULT_PAGE_SIZE;
  const page = p.page ?? 1;
  const dir = p.dir ?? DEFAULT_DIR.contrast;
  const pool = await runSearch(actor, { ...p, sort: 'throughput', dir: 'desc', page: 1, pageSize: CONTRAST_CANDIDATES }, options);
  const gain = await contrastOf(p, pool.items);
  const ordered = [...pool.items].sort(byContrast(gain, dir));
  const items = ordered.slice((page - 1) * pageSize, page * pageSize).map((i) => ({ ...i, skyGain: gain.get(i.id) ?? null }));
  const sky = p.sky ?? DEFAULT_CONTRAST_SKY;
  return {
    ...pool,
    items,
    total: Math.min(pool.total, CONTRAST_CANDIDATES),
    page,
    pageSize,
    sort: 'contrast',
    dir,
    contrast: {
      sky,
      referenceBoxNm: CONTRAST_REFERENCE_BOX_NM,
      candidates: pool.items.length,
      note:
        pool.total > CONTRAST_CANDIDATES
          ? `Contrast is computed exactly for the ${CONTRAST_CANDIDATES} matches with the highest line throughput (of ${pool.total}); the others are not ranked.`
          : `Contrast is computed exactly for all ${pool.total} matches.`,
    },
  };
}

/** A fitness search over the verified catalogue, from the in-process copy (memory-search.ts); the page's rows from SQL. */
async function searchCopy(actor: Actor | null, p: SearchParams & { fNumber: number }): Promise<SearchResult | null> {
  const o = ordering(p);
  const pl = await plan(actor, p, false);
  const answer = await searchInMemory(p, pl.weights!, pl.pupil!, o.sort, o.dir, o.page, o.pageSize);
  if (!answer) return null;
  const { ids, taus, groups } = answer;
  const found = ids.length
    ? await db().sequelize.query<PageRow>(
        `SELECT ${PAGE_COLUMNS}, NULL AS snippet, sp.wavelength_nm AS spark_w, sp.transmission AS spark_t
         FROM curves c LEFT JOIN curve_sparklines sp ON sp.curve_id = c.id WHERE c.id = ANY($1::int[])`,
        { bind: [ids], type: QueryTypes.SELECT },
      )
    : [];
  const byId = new Map(found.map((r) => [r.id, r]));
  const rows = ids.flatMap((id, k) => {
    const r = byId.get(id);
    return r ? [{ ...r, tau: taus[k] }] : [];
  });
  return assemble(p, pl, o, rows, groups);
}

async function assemble(p: SearchParams, pl: Plan, o: { sort: Sort; dir: 'asc' | 'desc'; page: number; pageSize: number }, rows: PageRow[], groups: CountGroup[]): Promise<SearchResult> {
  const { total, facets } = tallyFacets(p, groups);
  facets.line.sort((a, z) => z.count - a.count || a.key.localeCompare(z.key));
  facets.method.sort((a, z) => z.count - a.count || a.key.localeCompare(z.key));
  facets.fwhm.sort((a, z) => parseFloat(a.key) - parseFloat(z.key));

  const sets = await unitSetsOf(rows.map((r) => ({ id: r.id, aoiDeg: r.aoi_deg })));
  const items: SearchItem[] = rows.map((r) => ({
    id: r.id,
    title: titleOf(r),
    label: r.label,
    maker: r.maker,
    lines: r.lines,
    cwlNm: normalCwlNm(r.cwl_nm, r.aoi_deg, r.n_eff),
    measuredCwlNm: r.cwl_nm,
    fwhmNm: r.fwhm_nm,
    peakT: r.peak_t,
    status: r.status,
    instrument: r.instrument,
    aoiDeg: r.aoi_deg,
    set: sets.get(r.id) ?? { aoiDeg: [r.aoi_deg], curveIds: [r.id] },
    verifiedAt: r.verified_at ? new Date(r.verified_at).toISOString() : null,
    ...(r.snippet && r.snippet.includes(MARK_START) ? { snippet: snippetHtml(r.snippet) } : {}),
    sparkline: { wavelengthNm: r.spark_w ?? [], transmission: r.spark_t ?? [] },
  }));

  const missingSpark = rows.filter((r) => !r.spark_w).map((r) => r.id);
  if (hasFitness(p) || missingSpark.length > 0) await finishPage(p, pl.pupil, items, missingSpark);

  return {
    items, total, ...o, facets,
    ...(hasFitness(p)
      ? { fitness: { lineId: p.line ?? null, fNumber: p.fNumber, obstruction: p.obstruction ?? 0, nEff: p.nEff ?? null, fieldAngleDeg: p.fieldAngleDeg ?? 0, gridLevel: pl.weights?.level ?? -1 } }
      : {}),
  };
}

/** Exact throughput (engine, the search's pupil) and any sparkline the page lacks. */
async function finishPage(p: SearchParams, pupil: Pupil | undefined, items: SearchItem[], missingSpark: number[]) {
  const byId = await curvePointsByIds(hasFitness(p) ? items.map((i) => i.id) : missingSpark);
  for (const item of items) {
    const r = byId.get(item.id);
    if (!r) continue;
    if (missingSpark.includes(item.id)) item.sparkline = sparklineOf(r.points, r.fwhmNm);
    if (pupil && hasFitness(p)) {
      const lineId = p.line ?? item.lines[0];
      const line = lineId ? findLine(lineId) : undefined;
      if (!line) continue;
      const c = prepareCurve(r.points);
      const params = { nEff: p.nEff ?? defaultNEff(r.nEff), measuredAoiDeg: r.aoiDeg };
      const tau = lineThroughput(c, pupil, line.airNm, params).throughput;
      item.throughput = tau;
      // error bar: a wavelength-scale error u acts as a pre-shift of ±u (as in the cone response)
      const u = wavelengthUncertaintyOf(r.method).nm;
      const ends = [-u, u].map((d) => lineThroughput(c, pupil, line.airNm, { ...params, preShiftNm: d }).throughput);
      item.throughputRange = [Math.min(tau, ...ends), Math.max(tau, ...ends)];
      item.speedEquivalentFNumber = tau > 1e-12 && c.peak > 0 ? p.fNumber * Math.sqrt(c.peak / tau) : null;
    }
  }
}

/** Ids of every verified curve a search matches, in its order (for exports; no paging). */
export function matchingVerifiedIds(typed: SearchParams, limit: number): Promise<{ ids: number[]; total: number }> {
  return readCatalogue(() => matchingIds(readSearchWords(typed).params, limit));
}

async function matchingIds(p: SearchParams, limit: number): Promise<{ ids: number[]; total: number }> {
  const pl = await plan(null, { ...p, status: undefined });
  const b = clauses(pl, new SqlParts());
  const { sort, dir } = ordering(p);
  const rows = await db().sequelize.query<{ id: number; total: string }>(
    `SELECT c.id, count(*) OVER () AS total FROM curves c ${b.joins} WHERE ${and([...b.common, b.line, b.method, b.fwhm])}
     ORDER BY ${orderBy(sort, dir, b)} LIMIT ${b.s.param(limit + 1)}`,
    { bind: b.s.bind, type: QueryTypes.SELECT },
  );
  // the search lists units; an export holds every curve of each, the lead first, then by angle
  const leads = rows.slice(0, limit).map((r) => r.id);
  const sets = await unitSetsOf(leads.map((id) => ({ id, aoiDeg: 0 })));
  const ids = leads.flatMap((id) => sets.get(id)!.curveIds);
  const units = rows.length ? Number(rows[0].total) : 0;
  return { ids: ids.slice(0, limit), total: units + ids.length - leads.length };
}
