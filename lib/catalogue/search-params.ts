/**
 * The catalogue's query parameters (docs/api.md §Search parameters, GET /api/curves): one zod schema for
 * the route handler, the export routes and the /curves page, which keeps its
 * whole state in the URL so a search is a link.
 */

import { z } from '@/lib/schemas/zod';
import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';

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

// Query strings carry text: an empty value means "not set", anything else must read as a number.
const num = (what: string, min: number, max: number, unit = '') =>
  z.preprocess(
    (v) => (v === '' || v === undefined || v === null ? undefined : typeof v === 'string' ? Number(v.trim()) : v),
    z
      .number({ error: `${what} must be a number` })
      .refine(Number.isFinite, `${what} must be a finite number`)
      .refine((v) => v >= min && v <= max, `${what} must be between ${min} and ${max}${unit}`)
      .optional(),
  ).describe(`${min}–${max}${unit}`);

const text = (max: number) =>
  z.preprocess((v) => (typeof v === 'string' ? v.trim() || undefined : v), z.string().max(max, `at most ${max} characters`).optional());

const choice = <T extends readonly [string, ...string[]]>(values: T, what: string) =>
  z.preprocess((v) => (v === '' ? undefined : v), z.enum(values, { error: `${what} must be one of ${values.join(', ')}` }).optional());

export const searchParamsSchema = z
  .object({
    q: text(200),
    line: choice(LINE_IDS, 'line'),
    cwlMin: num('cwlMin', 100, 3000, ' nm'),
    cwlMax: num('cwlMax', 100, 3000, ' nm'),
    fwhmMin: num('fwhmMin', 0, 500, ' nm'),
    fwhmMax: num('fwhmMax', 0, 500, ' nm'),
    // repeatable (fwhmBucket=2-3&fwhmBucket=3-4) or comma-separated: curves in any of the buckets
    fwhmBucket: z.preprocess(
      (v) => {
        const list = (Array.isArray(v) ? v : typeof v === 'string' ? [v] : []).flatMap((x) => String(x).split(',')).map((x) => x.trim()).filter(Boolean);
        return list.length ? [...new Set(list)] : undefined;
      },
      z.array(z.enum(BUCKET_KEYS, { error: `fwhmBucket must be one of ${BUCKET_KEYS.join(', ')}` })).max(BUCKET_KEYS.length).optional(),
    ),
    peakMin: num('peakMin', 0, 1, ' (a fraction, 0.9 for 90 %)'),
    method: choice(INSTRUMENTS, 'method'),
    aoiMin: num('aoiMin', 0, 60, '°'),
    aoiMax: num('aoiMax', 0, 60, '°'),
    status: choice(STATUS_FILTERS, 'status'),
    contributor: z.preprocess((v) => (v === '' ? undefined : v), z.uuid({ error: 'contributor must be a contributor id' }).optional()),
    fNumber: num('fNumber', 0.5, 40),
    obstruction: num('obstruction', 0, 0.9, ' (a diameter ratio)'),
    nEff: num('nEff', 1, 4),
    fieldAngleDeg: num('fieldAngleDeg', 0, 30, '°'),
    minThroughput: num('minThroughput', 0, 1, ' (a fraction, 0.85 for 85 %)'),
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
    if (p.fNumber !== undefined && p.fieldAngleDeg !== undefined && p.fieldAngleDeg + (Math.atan(1 / (2 * p.fNumber)) * 180) / Math.PI >= 89.9) {
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

