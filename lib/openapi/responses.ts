/**
 * The shapes the handlers answer with, written once as zod so the OpenAPI
 * document shows them and the coverage test checks real answers against them
 * (tests/integration/openapi.test.ts). Loose objects: a field added to an answer
 * never breaks a client, so the schemas name what a client may rely on.
 */
import { z } from 'zod';

const nm = z.number().describe('nm, standard air');
const fraction = z.number().min(0).max(1);
const points = z.object({ wavelengthNm: z.array(z.number()), transmission: z.array(z.number()) });

export const errorBody = z.object({
  error: z.string().describe('One readable sentence: what is wrong and where.'),
  details: z.array(z.looseObject({ message: z.string(), field: z.string().optional(), line: z.number().int().optional() })),
});

export const curvePoints = points;

export const searchItem = z.looseObject({
  id: z.number().int(),
  title: z.string(),
  label: z.string(),
  maker: z.string().nullable(),
  lines: z.array(z.string()),
  cwlNm: nm.nullable().describe('CWL at normal incidence: the measured CWL brought there with the set\'s fitted n_eff, else 2.0 (the CWL filter and order use it).'),
  measuredCwlNm: nm.nullable().describe('CWL as measured, at aoiDeg.'),
  fwhmNm: z.number().nullable(),
  peakT: fraction,
  status: z.string(),
  instrument: z.string(),
  aoiDeg: z.number(),
  set: z
    .object({ aoiDeg: z.array(z.number()), curveIds: z.array(z.number().int()) })
    .describe('The unit this row stands for: every angle it was measured at and the curve of each, lowest angle first (a curve alone is a set of one).'),
  throughput: fraction.optional().describe('Line throughput on the named optic (fitness searches only).'),
  speedEquivalentFNumber: z.number().nullable().optional(),
});

export const searchResult = z.looseObject({
  items: z.array(searchItem),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
  sort: z.string(),
  dir: z.enum(['asc', 'desc']),
  facets: z.looseObject({}),
  understood: z
    .array(
      z.object({
        kind: z.enum(['line', 'width', 'cwl', 'optic', 'obstruction', 'threshold']),
        text: z.string().describe('The words it was read from, as typed.'),
        params: z.record(z.string(), z.union([z.string(), z.number()])).describe('The search parameters it stands for.'),
        applied: z.boolean().describe('False when an explicit parameter of the same kind took its place, or an obstruction lacks an optic.'),
      }),
    )
    .optional()
    .describe('With q: the filters read from its words (docs/api.md §Search parameters).'),
  words: z.string().optional().describe('With q: the words left for the full-text search.'),
  nearest: z
    .object({
      bestThroughput: fraction.optional().describe('Best exact line throughput a curve matching every other filter reaches on the optic.'),
      relaxations: z.array(
        z.object({
          label: z.string(),
          params: z.record(z.string(), z.string().nullable()).describe('Change to the query string: a value to set, null to remove.'),
          total: z.number().int().describe('Curves the relaxed search finds, counted by running it.'),
        }),
      ),
    })
    .optional()
    .describe('Only when total is 0: the nearest answers.'),
});

export const curveDetail = z.looseObject({
  id: z.number().int(),
  title: z.string(),
  label: z.string(),
  maker: z.string().nullable(),
  lines: z.array(z.object({ id: z.string(), name: z.string(), wavelengthNm: nm })),
  status: z.string(),
  revision: z.number().int(),
  licence: z.string(),
  nominal: z.object({ cwlNm: z.number().nullable(), fwhmNm: z.number().nullable(), preShiftNm: z.number().nullable() }),
  method: z.looseObject({}),
  instrument: z.string(),
  aoiDeg: z.number(),
  derived: z.looseObject({
    peakT: fraction,
    cwlNm: z.number().nullable(),
    fwhmNm: z.number().nullable(),
    meanInBandT: z.number().nullable(),
    effectiveBandwidthNm: z.number().nullable(),
    blockingOd: z.number().nullable(),
    nEff: z.number().nullable(),
    pointCount: z.number().int(),
  }),
  reviews: z.array(z.looseObject({ kind: z.string(), note: z.string(), at: z.string() })),
  citation: z.string(),
  links: z.looseObject({ self: z.string(), points: z.string(), csv: z.string() }),
});

export const curveDetailWithPoints = curveDetail.extend({ points });

export const line = z.object({ id: z.string(), name: z.string(), airNm: nm, vacuumNm: z.number() });
export const lineList = z.array(line);

export const coneResult = z.looseObject({
  lines: z.array(
    z.looseObject({
      id: z.string().nullable(),
      wavelengthNm: z.number(),
      collimated: fraction,
      throughput: fraction,
      speedEquivalentFNumber: z.number().nullable(),
    }),
  ),
  bestPreShift: z.object({ nm: z.number(), throughput: fraction }).nullable(),
  neighbours: z.array(z.looseObject({})),
  contrast: z.number().nullable(),
  angleHistogram: z.array(z.object({ deg: z.number(), weight: z.number() })),
  coneCurve: points.optional(),
  warnings: z.array(z.string()),
});

export const neffResult = z.object({ nEff: z.number(), cwl0Nm: z.number(), rmsResidualNm: z.number() });

export const previewResult = z.looseObject({
  points,
  assumed: z.looseObject({}).nullable(),
  metrics: z.looseObject({ peakT: z.number(), cwlNm: z.number().nullable(), fwhmNm: z.number().nullable() }),
  checks: z.array(z.looseObject({ code: z.string(), level: z.enum(['info', 'warn', 'error']), message: z.string() })),
  warnings: z.array(z.string()),
});

export const optic = z.looseObject({
  id: z.number().int(),
  name: z.string(),
  isExample: z.boolean(),
  mine: z.boolean(),
  fNumber: z.number(),
  obstruction: z.number(),
  fieldAngleDeg: z.number(),
  apertureMm: z.number().nullable(),
  focalLengthMm: z.number().nullable(),
  derived: z.object({ fNumber: z.boolean(), obstruction: z.boolean(), fieldAngleDeg: z.boolean() }),
});
export const opticList = z.object({ items: z.array(optic), total: z.number().int() });

export const submissionCreated = z.looseObject({
  id: z.number().int(),
  status: z.string(),
  checks: z.array(z.looseObject({ code: z.string(), level: z.string(), message: z.string() })),
  curveIds: z.array(z.number().int()),
});
export const presigned = z.object({
  uploadId: z.uuid(),
  method: z.literal('PUT'),
  url: z.string().describe('Presigned address of the staging key; good until expiresAt.'),
  headers: z.record(z.string(), z.string()).describe('Headers to send with the PUT.'),
  expiresAt: z.string(),
});
export const submissionList = z.looseObject({ items: z.array(z.looseObject({ id: z.number().int(), status: z.string() })), total: z.number().int() });
export const submissionDetail = z.looseObject({ id: z.number().int(), status: z.string() });
export const reviewResult = z.looseObject({ status: z.string() });
export const note = z.looseObject({});

export const tokenCreated = z.object({ id: z.number().int(), name: z.string(), token: z.string().describe('Shown once; only its hash is stored.') });
export const tokenList = z.object({
  items: z.array(z.looseObject({ id: z.number().int(), name: z.string(), prefix: z.string(), createdAt: z.string(), lastUsedAt: z.string().nullable(), revokedAt: z.string().nullable() })),
});

export const flag = (name: string) => z.object({ [name]: z.literal(true) });
export const registered = z.object({ email: z.string(), confirmationSent: z.literal(true) });
export const sessionsEnded = z.object({ sessionsEnded: z.number().int() });
export const userChanged = z.looseObject({ id: z.string(), role: z.string() });
export const csrf = z.object({ csrfToken: z.string() });
export const session = z.looseObject({});
export const openApiDocument = z.looseObject({ openapi: z.string(), paths: z.looseObject({}) });

const spreadStats = z.object({ mean: z.number().nullable(), sd: z.number().nullable().describe('sample standard deviation (n − 1)'), min: z.number().nullable(), max: z.number().nullable() });

export const odds = z.object({
  label: z.string(), units: z.number().int(), meeting: z.number().int().nullable(), probability: z.number().nullable(),
  cwlSpreadNm: spreadStats, fwhmSpreadNm: spreadStats, reason: z.string().optional(),
}).passthrough();

export const fieldMap = z.object({
  centre: z.number(), corner: z.number(), edgeX: z.number(), edgeY: z.number(),
  areaAtLeast: z.array(z.object({ threshold: z.number(), share: z.number() })),
  grid: z.object({ xMm: z.array(z.number()), yMm: z.array(z.number()), throughput: z.array(z.array(z.number())) }),
}).passthrough();
