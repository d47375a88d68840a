/**
 * The catalogue's query parameters (docs/api.md §Search parameters, GET /api/curves): one zod schema for
 * the route handler, the export routes and the /curves page, which keeps its
 * whole state in the URL so a search is a link.
 */

import { z } from '@/lib/schemas/zod';
import { LINE_IDS } from '@/lib/engine/lines';
import { INSTRUMENTS } from '@/lib/engine/limits';
import { marginalRayDeg } from '@/lib/engine/pupil';
import { NUMBER_LIMITS, type LimitedParam } from './limits';
import { readQuantity } from './quantities';

export const SORTS = ['relevance', 'cwl', 'fwhm', 'peak', 'throughput', 'newest', 'contrast'] as const;
/** Sky models the contrast sort accepts (lib/engine/sky.ts). */
export const SKY_MODEL_IDS = ['dark', 'suburban', 'led-town'] as const;
export type Sort = (typeof SORTS)[number];
export const STATUS_FILTERS = ['verified', 'submitted', 'changes_requested', 'rejected', 'superseded', 'any'] as const;
export const MAX_PAGE_SIZE = 100;
export const DEFAULT_PAGE_SIZE = 20;

/** Natural direction of each sort: best or most useful first. */
export const DEFAULT_DIR: Record<Sort, 'asc' | 'desc'> = {
  relevance: 'desc', cwl: 'asc', fwhm: 'asc', peak: 'desc', throughput: 'desc', newest: 'desc', contrast: 'desc',
};

/** FWHM facet buckets, nm: [from, to). */
export const FWHM_BUCKETS: readonly [number, number | null][] = [
  [0, 1], [1, 2], [2, 3], [3, 4], [4, 5], [5, 7], [7, 10], [10, 15], [15, 30], [30, null],
];

export function bucketKey([a, b]: readonly [number, number | null]): string {
  return b === null ? `${a}+` : `${a}-${b}`;
}

const BUCKET_KEYS = FWHM_BUCKETS.map(bucketKey) as [string, ...string[]];

// Query strings carry text: an empty value means "not set", anything else is read as the number fields
// read it (quantities.ts: "f/2", "85 %", "5 nm", "50 Å"; a bare number in the parameter's own unit).
const num = (param: LimitedParam) => {
  const l = NUMBER_LIMITS[param];
  return z
    .preprocess((v, ctx) => {
      if (v === '' || v === undefined || v === null) return undefined;
      if (typeof v !== 'string') return v;
      const r = readQuantity(param, v);
      if (r.error) {
        ctx.addIssue({ code: 'custom', message: r.error, input: v });
        return z.NEVER;
      }
      return r.value ?? undefined;
    }, z.number({ error: `${param} must be a number` }).refine(Number.isFinite, `${param} must be a finite number`).refine((v) => v >= l.min && v <= l.max, `${l.label} must be between ${l.min} and ${l.max}${l.unit}`).optional())
    .describe(`${l.min}–${l.max}`);
};

const text = (max: number) =>
  z.preprocess((v) => (typeof v === 'string' ? v.trim() || undefined : v), z.string().max(max, `at most ${max} characters`).optional());

const choice = <T extends readonly [string, ...string[]]>(values: T, what: string) =>
  z.preprocess((v) => (v === '' ? undefined : v), z.enum(values, { error: `${what} must be one of ${values.join(', ')}` }).optional());

export const searchParamsSchema = z
  .object({
    q: text(200),
    line: choice(LINE_IDS, 'line'),
    cwlMin: num('cwlMin'),
    cwlMax: num('cwlMax'),
    fwhmMin: num('fwhmMin'),
    fwhmMax: num('fwhmMax'),
    // repeatable (fwhmBucket=2-3&fwhmBucket=3-4) or comma-separated: curves in any of the buckets
    fwhmBucket: z.preprocess(
      (v) => {
        const list = (Array.isArray(v) ? v : typeof v === 'string' ? [v] : []).flatMap((x) => String(x).split(',')).map((x) => x.trim()).filter(Boolean);
        return list.length ? [...new Set(list)] : undefined;
      },
      z.array(z.enum(BUCKET_KEYS, { error: `fwhmBucket must be one of ${BUCKET_KEYS.join(', ')}` })).max(BUCKET_KEYS.length).optional(),
    ),
    peakMin: num('peakMin'),
    method: choice(INSTRUMENTS, 'method'),
    aoiMin: num('aoiMin'),
    aoiMax: num('aoiMax'),
    status: choice(STATUS_FILTERS, 'status'),
    contributor: z.preprocess((v) => (v === '' ? undefined : v), z.uuid({ error: 'contributor must be a contributor id' }).optional()),
    fNumber: num('fNumber'),
    obstruction: num('obstruction'),
    nEff: num('nEff'),
    fieldAngleDeg: num('fieldAngleDeg'),
    minThroughput: num('minThroughput'),
    sort: choice(SORTS, 'sort'),
    sky: choice(SKY_MODEL_IDS, 'sky'),
    dir: choice(['asc', 'desc'] as const, 'dir'),
    page: z.preprocess(
      (v) => (v === '' || v === undefined ? undefined : Number(v)),
      z.number({ error: 'page must be a whole number' }).int('page must be a whole number').min(1, 'page starts at 1').max(100_000, 'page is too large').optional(),
    ),
    pageSize: z.preprocess(
      (v) => (v === '' || v === undefined ? undefined : Number(v)),
      z
        .number({ error: 'pageSize must be a whole number' })
        .int('pageSize must be a whole number')
        .min(1, 'pageSize must be at least 1')
        .max(MAX_PAGE_SIZE, `pageSize must be at most ${MAX_PAGE_SIZE}`)
        .optional(),
    ),
  })
  .superRefine((p, ctx) => {
    const pair = (lo: number | undefined, hi: number | undefined, a: string, b: string) => {
      if (lo !== undefined && hi !== undefined && lo > hi) ctx.addIssue({ code: 'custom', path: [a], message: `${a} (${lo}) is above ${b} (${hi})` });
    };
    pair(p.cwlMin, p.cwlMax, 'cwlMin', 'cwlMax');
    pair(p.fwhmMin, p.fwhmMax, 'fwhmMin', 'fwhmMax');
    pair(p.aoiMin, p.aoiMax, 'aoiMin', 'aoiMax');
    if (p.fNumber === undefined) {
      for (const k of ['obstruction', 'nEff', 'fieldAngleDeg', 'minThroughput'] as const) {
        if (p[k] !== undefined) ctx.addIssue({ code: 'custom', path: [k], message: `${k} is part of the fitness filter and needs fNumber too` });
      }
      if (p.sort === 'throughput') ctx.addIssue({ code: 'custom', path: ['sort'], message: 'sorting by throughput needs an optic: give fNumber (and obstruction)' });
      if (p.sort === 'contrast') ctx.addIssue({ code: 'custom', path: ['sort'], message: 'sorting by contrast needs an optic: give fNumber (and obstruction)' });
    }
    if (p.fNumber !== undefined && p.fieldAngleDeg !== undefined && p.fieldAngleDeg + marginalRayDeg(p.fNumber) >= 89.9) {
      ctx.addIssue({ code: 'custom', path: ['fieldAngleDeg'], message: 'this field angle and f-number send light in at grazing incidence' });
    }
  });

export type SearchParams = z.output<typeof searchParamsSchema>;

/** Parameters that may be given more than once. */
export const REPEATABLE: readonly string[] = ['fwhmBucket'];

/** Parses a query string; zod errors become a 422 through withErrors. */
export function parseSearchParams(params: URLSearchParams | Record<string, string | string[] | undefined>): SearchParams {
  const raw: Record<string, string | string[]> = {};
  if (params instanceof URLSearchParams) params.forEach((v, k) => (raw[k] = REPEATABLE.includes(k) ? params.getAll(k) : v));
  else for (const [k, v] of Object.entries(params)) if (typeof v === 'string' || (Array.isArray(v) && REPEATABLE.includes(k))) raw[k] = v;
  return searchParamsSchema.parse(raw);
}

export function hasFitness(p: SearchParams): p is SearchParams & { fNumber: number } {
  return p.fNumber !== undefined;
}

/** The URL form of a search, with defaults left out so links stay short. */
export function toQueryString(p: Partial<Record<keyof SearchParams, string | number | undefined>>): string {
  const u = new URLSearchParams();
  for (const [k, v] of Object.entries(p)) {
    if (v === undefined || v === null || v === '') continue;
    if (k === 'page' && Number(v) === 1) continue;
    if (k === 'pageSize' && Number(v) === DEFAULT_PAGE_SIZE) continue;
    u.set(k, String(v));
  }
  return u.toString();
}

