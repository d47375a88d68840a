import { describe, expect, it } from 'vitest';
import { checkFacetPacking, FILTERS, groupKey, groupOf, PACKING, SORT_COLUMNS, bucketIndex, FWHM_EDGES } from '@/lib/catalogue/filters';
import { FWHM_BUCKETS, SORTS, bucketKey, searchParamsSchema } from '@/lib/catalogue/search-params';
import { widthBucket } from '@/lib/catalogue/memory-index';
import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';

describe('the catalogue filter table', () => {
  it('names every filtering parameter of the search schema once', () => {
    // parameters that are not row filters: words, the optic (fitness), paging, order, status (visibility)
    const notFilters = ['q', 'status', 'fNumber', 'obstruction', 'nEff', 'fieldAngleDeg', 'minThroughput', 'sort', 'sky', 'dir', 'page', 'pageSize'];
    const keys = Object.keys(searchParamsSchema.shape).filter((k) => !notFilters.includes(k)).sort();
    expect(FILTERS.map((f) => f.param).sort()).toEqual(keys);
    expect(new Set(FILTERS.map((f) => f.param)).size).toBe(FILTERS.length);
  });

  it('describes every sort that reads one column; the others are the computed ones', () => {
    expect(SORTS.filter((s) => !SORT_COLUMNS[s])).toEqual(['relevance', 'throughput', 'contrast']);
  });

  it('packs today\'s lists, and refuses a ninth instrument, a sixteenth FWHM bucket or a 32nd line instead of counting wrongly', () => {
    expect(() => checkFacetPacking({ instruments: INSTRUMENTS.length, buckets: FWHM_BUCKETS.length, lines: LINE_IDS.length })).not.toThrow();
    expect(() => checkFacetPacking({ instruments: 8, buckets: 15, lines: 31 })).not.toThrow();
    expect(() => checkFacetPacking({ instruments: 9, buckets: 10, lines: 13 })).toThrow(/at most 8 instruments; there are 9/);
    expect(() => checkFacetPacking({ instruments: 4, buckets: 16, lines: 13 })).toThrow(/at most 15 FWHM buckets; there are 16/);
    expect(() => checkFacetPacking({ instruments: 4, buckets: 10, lines: 32 })).toThrow(/at most 31 lines/);
  });

  it('a group key reads back as the parts it was made of, for every slot', () => {
    for (const lineSet of [0, 1, 57])
      for (let bucket = 0; bucket < PACKING.bucketSlots; bucket++)
        for (let instrument = 0; instrument < PACKING.instrumentSlots; instrument++)
          for (const pf of [false, true]) expect(groupOf(groupKey(lineSet, bucket, instrument, pf))).toEqual({ lineSet, bucket, instrument, pf });
  });

  it('numbers FWHM buckets as PostgreSQL\'s width_bucket does (documented: index of the last edge ≤ x)', () => {
    // PostgreSQL manual, §9.3 Mathematical Functions: width_bucket(operand, thresholds) returns the number of the bucket
    // the operand falls in, 0 below the first threshold; buckets are [lower, upper).
    expect(widthBucket(0.5)).toBe(0);
    expect(widthBucket(1)).toBe(1);
    expect(widthBucket(2.999)).toBe(2);
    expect(widthBucket(3)).toBe(3);
    expect(widthBucket(1000)).toBe(FWHM_EDGES.length);
    FWHM_BUCKETS.forEach((b, k) => {
      expect(bucketIndex(bucketKey(b))).toBe(k);
      expect(widthBucket(b[0])).toBe(k);
    });
    expect(() => bucketIndex('2-4')).toThrow(/no FWHM bucket/);
  });
});
