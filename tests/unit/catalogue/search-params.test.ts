import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { parseSearchParams, toQueryString } from '@/lib/catalogue/search-params';

function refusal(qs: string): { field?: string; message: string } {
  try {
    parseSearchParams(new URLSearchParams(qs));
  } catch (e) {
    if (e instanceof ZodError) return { field: e.issues[0].path.join('.'), message: e.issues[0].message };
    throw e;
  }
  throw new Error(`"${qs}" was accepted`);
}

describe('catalogue query parameters (docs/api.md §Search parameters, GET /api/curves)', () => {
  it('reads numbers, ids and choices from a query string and leaves empty values unset', () => {
    const p = parseSearchParams(new URLSearchParams('q=hydrogen+alpha&line=Ha&fwhmMax=5&fNumber=2.5&obstruction=0.36&minThroughput=0.85&sort=throughput&pageSize=50&cwlMin='));
    expect(p).toMatchObject({ q: 'hydrogen alpha', line: 'Ha', fwhmMax: 5, fNumber: 2.5, obstruction: 0.36, minThroughput: 0.85, sort: 'throughput', pageSize: 50 });
    expect(p.cwlMin).toBeUndefined();
  });

  it.each([
    ['fwhmMax=wide', 'fwhmMax', /number/],
    ['line=Halpha', 'line', /Ha, Hb/],
    ['cwlMin=700&cwlMax=600', 'cwlMin', /above cwlMax/],
    ['pageSize=101', 'pageSize', /at most 100/],
    ['page=0', 'page', /starts at 1/],
    ['peakMin=90', 'peakMin', /fraction/],
    ['minThroughput=0.8', 'minThroughput', /needs fNumber/],
    ['sort=throughput', 'sort', /needs an optic/],
    ['fNumber=0.3', 'fNumber', /between 0.5 and 40/],
    ['fNumber=2&obstruction=1', 'obstruction', /between 0 and 0.9/],
    ['fNumber=2&fieldAngleDeg=31', 'fieldAngleDeg', /between 0 and 30/],
    ['method=ruler', 'method', /spectrophotometer/],
    ['contributor=bob', 'contributor', /contributor id/],
    ['sort=cheapest', 'sort', /relevance/],
  ])('refuses %s with a readable reason naming %s', (qs, field, message) => {
    const r = refusal(qs);
    expect(r.field).toBe(field);
    expect(r.message).toMatch(message);
  });

  it('writes short links: defaults and empty values are left out', () => {
    expect(toQueryString({ q: 'oiii', page: 1, pageSize: 20, fwhmMax: 5, line: undefined })).toBe('q=oiii&fwhmMax=5');
  });
});
