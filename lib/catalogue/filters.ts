/**
 * The catalogue's filters and sorts, each described once: the query parameter, the
 * column it reads in SQL (search.ts) and the field of the in-process copy
 * (memory-index.ts), and the operator. Both ways of answering a search are derived
 * from these tables, so a filter added here is added to both;
 * tests/integration/catalogue-memory.test.ts holds their answers equal.
 */

import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';
import { bucketKey, FWHM_BUCKETS, type SearchParams, type Sort } from './search-params';
import { normalCwlSql } from './units';

/** Number columns of a curve the copy keeps as Float64Array (NaN for NULL). */
export type NumberField = 'normalCwl' | 'fwhm' | 'peak' | 'aoi' | 'verifiedAt';

/**
 * Which facet leaves the filter out when it counts (facets count as if their own filter were not set);
 * `null`: every facet keeps it.
 */
export type FacetName = 'line' | 'method' | 'fwhm';

export type Filter =
  /** column >= value, or <= value; NULL never passes (SQL's comparison, NaN in the copy). */
  | { param: 'cwlMin' | 'cwlMax' | 'fwhmMin' | 'fwhmMax' | 'peakMin' | 'aoiMin' | 'aoiMax'; column: string; field: NumberField; operator: '>=' | '<='; facet: FacetName | null }
  /** The FWHM facet's buckets ([from, to), FWHM_BUCKETS), any of those named. */
  | { param: 'fwhmBucket'; column: string; field: 'fwhmBucket'; operator: 'bucket-in'; facet: 'fwhm' }
  /** One of the curve's target lines. */
  | { param: 'line'; column: string; field: 'lineMask'; operator: 'has'; facet: 'line' }
  | { param: 'method'; column: string; field: 'instrument'; operator: '='; facet: 'method' }
  | { param: 'contributor'; column: string; field: 'contributor'; operator: '='; facet: null; cast: string };

export const FILTERS: readonly Filter[] = [
  // the CWL of a filter or an order is at normal incidence (units.ts)
  { param: 'cwlMin', column: normalCwlSql('c'), field: 'normalCwl', operator: '>=', facet: null },
  { param: 'cwlMax', column: normalCwlSql('c'), field: 'normalCwl', operator: '<=', facet: null },
  { param: 'peakMin', column: 'c.peak_t', field: 'peak', operator: '>=', facet: null },
  { param: 'aoiMin', column: 'c.aoi_deg', field: 'aoi', operator: '>=', facet: null },
  { param: 'aoiMax', column: 'c.aoi_deg', field: 'aoi', operator: '<=', facet: null },
  { param: 'contributor', column: 'c.contributor_id', field: 'contributor', operator: '=', facet: null, cast: '::uuid' },
  { param: 'line', column: 'c.lines', field: 'lineMask', operator: 'has', facet: 'line' },
  { param: 'method', column: 'c.instrument', field: 'instrument', operator: '=', facet: 'method' },
  { param: 'fwhmMin', column: 'c.fwhm_nm', field: 'fwhm', operator: '>=', facet: 'fwhm' },
  { param: 'fwhmMax', column: 'c.fwhm_nm', field: 'fwhm', operator: '<=', facet: 'fwhm' },
  { param: 'fwhmBucket', column: 'c.fwhm_nm', field: 'fwhmBucket', operator: 'bucket-in', facet: 'fwhm' },
];

/** The filters a search sets, in table order. */
export function activeFilters(p: SearchParams): Filter[] {
  return FILTERS.filter((f) => {
    const v = p[f.param];
    return v !== undefined && !(Array.isArray(v) && v.length === 0);
  });
}

/**
 * Sorts that read one column (the others, relevance and throughput, are worked out per search). `nulls`:
 * where curves without the value go: 'last' both ways; 'index' as PostgreSQL's default, which is what
 * the column's index gives read forward or backward (NULL last ascending, first descending, and never
 * met for a NOT NULL column); 'first-when-asc' last when descending, first when ascending.
 */
export const SORT_COLUMNS: Partial<Record<Sort, { column: string; field: NumberField; nulls: 'last' | 'index' | 'first-when-asc' }>> = {
  cwl: { column: normalCwlSql('c'), field: 'normalCwl', nulls: 'last' },
  fwhm: { column: 'c.fwhm_nm', field: 'fwhm', nulls: 'last' },
  peak: { column: 'c.peak_t', field: 'peak', nulls: 'index' },
  newest: { column: 'c.verified_at', field: 'verifiedAt', nulls: 'first-when-asc' },
};

/** Whether curves without the sort's value come first. */
export function nullsFirst(nulls: 'last' | 'index' | 'first-when-asc', dir: 'asc' | 'desc'): boolean {
  return nulls === 'index' ? dir === 'desc' : nulls === 'first-when-asc' && dir === 'asc';
}

/** The FWHM edges PostgreSQL's width_bucket and the copy both count against. */
export const FWHM_EDGES: readonly number[] = FWHM_BUCKETS.slice(1).map(([a]) => a);

/** SQL's width_bucket over FWHM_EDGES: 0 below the first edge, k when EDGES[k-1] ≤ x < EDGES[k]. */
export const FWHM_BUCKET_SQL = `width_bucket(c.fwhm_nm, ARRAY[${FWHM_EDGES.join(',')}]::float8[])`;

/** Index in FWHM_BUCKETS of a bucket key ("2-3", "30+"), as width_bucket numbers it. */
export function bucketIndex(key: string): number {
  const k = FWHM_BUCKETS.findIndex((b) => bucketKey(b) === key);
  if (k < 0) throw new Error(`no FWHM bucket ${key}`);
  return k;
}

/*
 * The copy counts facets in one typed array keyed by (line set, FWHM bucket, instrument, FWHM filter holds),
 * and keeps each curve's lines as bits of an Int32 and its bucket in a byte. Each part has a fixed width;
 * a list that outgrows its width would count one kind as another, so the widths are checked when the
 * module loads (and a curve with an unknown instrument is refused, memory-index.ts).
 */
export const PACKING = { instrumentSlots: 8, bucketSlots: 16, lineBits: 31 } as const;

export function checkFacetPacking(sizes: { instruments: number; buckets: number; lines: number }): void {
  if (sizes.instruments > PACKING.instrumentSlots) {
    throw new Error(`The in-memory facets pack at most ${PACKING.instrumentSlots} instruments; there are ${sizes.instruments}. Widen the packing in memory-search.ts.`);
  }
  // bucket 0 is "FWHM unknown"
  if (sizes.buckets + 1 > PACKING.bucketSlots) {
    throw new Error(`The in-memory facets pack at most ${PACKING.bucketSlots - 1} FWHM buckets; there are ${sizes.buckets}. Widen the packing in memory-search.ts.`);
  }
  if (sizes.lines > PACKING.lineBits) {
    throw new Error(`The in-memory copy keeps at most ${PACKING.lineBits} lines as bits; there are ${sizes.lines}. Widen lineMask in memory-index.ts.`);
  }
}

checkFacetPacking({ instruments: INSTRUMENTS.length, buckets: FWHM_BUCKETS.length, lines: LINE_IDS.length });

/** The key of one facet group in the copy's count array, and back. */
export function groupKey(lineSet: number, bucket: number, instrument: number, pf: boolean): number {
  return ((lineSet * PACKING.bucketSlots + bucket) * PACKING.instrumentSlots + instrument) * 2 + (pf ? 1 : 0);
}

export function groupOf(key: number): { lineSet: number; bucket: number; instrument: number; pf: boolean } {
  return {
    pf: key % 2 === 1,
    instrument: Math.floor(key / 2) % PACKING.instrumentSlots,
    bucket: Math.floor(key / (2 * PACKING.instrumentSlots)) % PACKING.bucketSlots,
    lineSet: Math.floor(key / (2 * PACKING.instrumentSlots * PACKING.bucketSlots)),
  };
}

export const GROUPS_PER_LINE_SET = 2 * PACKING.instrumentSlots * PACKING.bucketSlots;
