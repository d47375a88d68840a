/**
 * Every route under app/api, described once. The request schemas are the very
 * zod schemas the handlers parse with; the answers are in ./responses. A new
 * route handler adds one entry here (tests/integration/openapi.test.ts fails
 * until it does). An `example` is a request the test sends to the running
 * server, expecting the entry's one 2xx status and a body its schema accepts;
 * give one wherever the request can run on the demo world without changing it
 * for others. Conventions (units, errors, authentication): docs/api.md.
 */
import { z } from 'zod';
import { searchParamsSchema } from '@/lib/catalogue/search-params';
import { coneRequestSchema, neffRequestSchema, pointsSchema, readerOptionsSchema } from '@/lib/schemas/model';
import { opticInputSchema, opticRawShape } from '@/lib/schemas/optics';
import { registerSchema, resetConfirmSchema, resetRequestSchema, roleChangeSchema } from '@/lib/schemas/account';
import { reviewDecisionSchema, submissionMetadataSchema, threadReplySchema } from '@/lib/schemas/submission';
import { createTokenSchema } from '@/lib/schemas/tokens';
import { fieldMapRequestSchema } from '@/lib/schemas/field-map';
import { oddsQuerySchema } from '@/lib/schemas/odds';
import { presignSchema } from '@/lib/schemas/upload';
import * as r from './responses';

export type Method = 'get' | 'post' | 'patch' | 'delete';

/** Who may call: the least role, or the public. Authorisation is always on the server. */
export type Access = 'public' | 'contributor' | 'moderator' | 'admin';

export interface ApiResponse {
  description: string;
  /** JSON body; omit for a body of another type (then give `type`). */
  schema?: z.ZodType;
  type?: string;
}

export interface ApiOperation {
  method: Method;
  /** OpenAPI form: /api/curves/{id} for app/api/curves/[id]/route.ts. */
  path: string;
  tag: 'Curves' | 'Model' | 'Optics' | 'Submissions' | 'Tokens' | 'Account' | 'Admin' | 'Sign-in' | 'Reference';
  summary: string;
  description?: string;
  access: Access;
  params?: z.ZodObject;
  query?: z.ZodObject;
  body?: { schema: z.ZodType; type?: 'application/json' | 'multipart/form-data' | 'application/x-www-form-urlencoded'; description?: string };
  /** Exactly one success status (2xx, or 3xx for a redirect); error statuses name what the handler refuses with. */
  responses: Record<number, ApiResponse>;
  example?: { params?: Record<string, string>; query?: Record<string, string>; body?: unknown };
}

const id = (what: string) => z.object({ id: z.string().describe(`${what} id (a whole number)`) });
const err = (description: string): ApiResponse => ({ description, schema: r.errorBody });

/** The refusals most handlers share (docs/api.md §Errors). */
const invalid = { 422: err('Well-formed but invalid: `details` names each field or file line.') };
const signedIn = { 401: err('Not signed in and no valid bearer token.'), 403: err('The role does not allow this.') };
const missing = { 404: err('No such record, or not one you may see.') };
const storeDown = err('The file store (S3 bucket of raw files) cannot be reached; nothing was saved. `Retry-After` says when to try again.');

// A multipart body is described by its fields; the handler reads it as a stream with size caps.
const submissionForm = z.object({
  file: z.string().describe('One or more data files (text; 5 MB each, 200 000 rows, at most 20 files).'),
  metadata: z.string().describe('JSON text of a SubmissionMetadata object (the fields of docs/product.md §What a curve carries).'),
});
const previewForm = z.object({
  file: z.string().describe('One data file (text, 5 MB at most).'),
  options: z.string().optional().describe('JSON text of a ReaderOptions object: units, delimiter, decimal separator, header lines, columns.'),
  metadata: z.string().optional().describe('JSON text: whatever of the submission metadata is known, for the checks.'),
});
const previewJson = z.object({ points: pointsSchema, metadata: z.looseObject({}).optional() });
const credentialsForm = z.object({ csrfToken: z.string(), email: z.string(), password: z.string() });

/** The four routes a search answers through share its query (docs/api.md §Search parameters). */
const search = searchParamsSchema;

export const API_OPERATIONS: readonly ApiOperation[] = [
  // ---------------------------------------------------------------- curves
  {
    method: 'get', path: '/api/curves', tag: 'Curves', access: 'public',
    summary: 'Search curves by words, numbers and fitness for an optic',
    description: 'A visitor sees verified curves; a contributor also their own; a moderator all. With `fNumber` (+ `obstruction`, `nEff`, `fieldAngleDeg`) each result carries its line throughput on that optic (on axis unless `fieldAngleDeg` is given), `minThroughput` keeps those that reach it, and the order defaults to line throughput. One item per physical unit: a curve set measured at several angles is one item, its lead curve (lowest AOI), with `set: { aoiDeg, curveIds }`; `total` and the facets count units. `cwlNm` (and `cwlMin`, `cwlMax`, `sort=cwl`) is at normal incidence, `measuredCwlNm` as measured. The words of `q` are read first: line names, widths, optics and thresholds become filters (`understood`), the rest stays `words`. Number parameters may carry their unit (`f/2`, `80 %`, `5 nm`). An empty answer carries `nearest`: the best throughput on the optic and relaxations with true counts.',
    query: search,
    responses: { 200: { description: 'One page of units, the total and facet counts; with q what its words were read as; when empty, the nearest answers.', schema: r.searchResult }, ...invalid },
    example: { query: { q: 'H-alpha 5 nm', fNumber: 'f/2.5', obstruction: '0.36', minThroughput: '50 %', pageSize: '5' } },
  },
  {
    method: 'get', path: '/api/curves/export.csv', tag: 'Curves', access: 'public',
    summary: 'Download the verified curves of a search as long-format CSV',
    description: '`curve_id,wavelength_nm,transmission` rows, with a `#` metadata block per curve; cells that could start a spreadsheet formula are neutralised.',
    query: search,
    responses: { 200: { description: 'CSV, streamed; `x-curve-count` says how many curves.', type: 'text/csv' }, ...invalid },
    example: { query: { line: 'OIII', fwhmMax: '3' } },
  },
  {
    method: 'get', path: '/api/curves/export.json', tag: 'Curves', access: 'public',
    summary: 'Download the verified curves of a search as JSON',
    query: search,
    responses: { 200: { description: 'JSON, streamed; `x-curve-count` says how many curves.', type: 'application/json' }, ...invalid },
    example: { query: { line: 'Hb', fwhmMax: '4' } },
  },
  {
    method: 'post', path: '/api/curves/preview', tag: 'Curves', access: 'public',
    summary: 'Read a data file or points and report what the engine makes of it (stores nothing)',
    description: 'Rate-limited per address. A file it cannot read gets 422 with line-numbered `details`.',
    body: { schema: previewJson, description: 'Or `multipart/form-data` with `file`, `options` and `metadata` fields.' },
    responses: { 200: { description: 'Clean points, what was assumed, derived numbers and checks.', schema: r.previewResult }, 400: err('Malformed body.'), 413: err('File over 5 MB.'), ...invalid, 429: err('Too many previews from this address.') },
    example: { body: { points: { wavelengthNm: [650, 652, 654, 655, 656, 657, 658, 660, 662], transmission: [0, 0.02, 0.4, 0.85, 0.9, 0.85, 0.4, 0.02, 0] } } },
  },
  {
    method: 'get', path: '/api/curves/{id}', tag: 'Curves', access: 'public',
    summary: 'One curve: metadata, test method, derived numbers, revision and public review history',
    params: id('Curve'),
    responses: { 200: { description: 'The curve.', schema: r.curveDetail }, ...missing },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/curves/{id}/points', tag: 'Curves', access: 'public',
    summary: 'The samples of one curve',
    params: id('Curve'),
    responses: { 200: { description: 'Wavelength (nm) and transmission (fraction) arrays.', schema: r.curvePoints }, ...missing },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/curves/{id}/csv', tag: 'Curves', access: 'public',
    summary: 'One curve as CSV that the upload reader reads back unchanged',
    params: id('Curve'),
    responses: { 200: { description: '`#` metadata lines, then `wavelength_nm,transmission` rows.', type: 'text/csv' }, ...missing },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/curves/{id}/json', tag: 'Curves', access: 'public',
    summary: 'One curve with its samples, as a JSON download',
    params: id('Curve'),
    responses: { 200: { description: 'The curve and its points.', schema: r.curveDetailWithPoints }, ...missing },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/curves/{id}/cite', tag: 'Curves', access: 'public',
    summary: 'Cite one revision of a curve: BibTeX or CSL JSON, with its permanent address',
    params: id('Curve'),
    query: z.object({ format: z.enum(['bibtex', 'csl']).optional().describe('bibtex (default) or csl') }),
    responses: { 200: { description: 'BibTeX (application/x-bibtex) or CSL JSON (application/vnd.citationstyles.csl+json).', type: 'application/x-bibtex' }, ...missing, ...invalid },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/curves/{id}/jcamp', tag: 'Curves', access: 'public',
    summary: 'One curve as JCAMP-DX 4.24, for laboratory software',
    params: id('Curve'),
    responses: { 200: { description: 'A JCAMP-DX file (UV/VIS spectrum, nm against transmittance).', type: 'chemical/x-jcamp-dx' }, ...missing },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/curves/{id}/votable', tag: 'Curves', access: 'public',
    summary: 'One curve and its metadata as an IVOA VOTable 1.4',
    params: id('Curve'),
    responses: { 200: { description: 'A VOTable: FIELDs with units (nm, dimensionless), the method as PARAMs.', type: 'application/x-votable+xml' }, ...missing },
    example: { params: { id: '1' } },
  },
  {
    method: 'get', path: '/api/labels/odds', tag: 'Curves', access: 'public',
    summary: 'Odds for a buyer: the share of a label\'s verified units that keep the line on an optic',
    description: 'Counted over the measured units and estimated from normal fits of their CWL and FWHM; fewer than three units answer with `probability: null` and a reason.',
    query: oddsQuerySchema,
    responses: { 200: { description: 'Units, how many meet the threshold, and the fitted probability.', schema: r.odds }, ...invalid },
    example: { query: { label: 'No such label', fNumber: '2.5', obstruction: '0.36', minThroughput: '0.8', line: 'Ha' } },
  },
  // ---------------------------------------------------------------- model
  {
    method: 'post', path: '/api/model/field-map', tag: 'Model', access: 'public',
    summary: 'Line throughput across the whole sensor',
    description: 'Centre, edge midpoints, corner, the share of the sensor that keeps each threshold, and a map `grid.throughput[y][x]` (docs/model.md).',
    body: { schema: fieldMapRequestSchema },
    responses: { 200: { description: 'The sensor map.', schema: r.fieldMap }, 400: err('Malformed JSON.'), ...missing, ...invalid },
    example: {
      body: {
        points: { wavelengthNm: [650, 653, 654.5, 655.5, 656.3, 657.1, 658.1, 659.6, 662.6], transmission: [0, 0.01, 0.45, 0.88, 0.9, 0.88, 0.45, 0.01, 0] },
        optic: { fNumber: 2.5, obstruction: 0.36 }, sensor: { widthMm: 23.5, heightMm: 15.6 }, exitPupilMm: 60, nEff: 2, lineNm: 656.28, grid: { nx: 20, ny: 14 },
      },
    },
  },
  {
    method: 'post', path: '/api/model/cone', tag: 'Model', access: 'public',
    summary: 'Run a curve through an optic\'s light cone',
    description: 'Line throughput beside the collimated value, best pre-shift, neighbour leakage, contrast, the angle histogram and optionally the cone-averaged curve (docs/model.md).',
    body: { schema: coneRequestSchema },
    responses: { 200: { description: 'The cone study.', schema: r.coneResult }, 400: err('Malformed JSON.'), ...missing, ...invalid },
    example: {
      body: {
        points: { wavelengthNm: [650, 653, 654.5, 655.5, 656.3, 657.1, 658.1, 659.6, 662.6], transmission: [0, 0.01, 0.45, 0.88, 0.9, 0.88, 0.45, 0.01, 0] },
        optic: { fNumber: 2.5, obstruction: 0.36, fieldAngleDeg: 4 }, nEff: 2, lines: ['Ha'], includeCurve: true,
      },
    },
  },
  {
    method: 'post', path: '/api/model/neff', tag: 'Model', access: 'public',
    summary: 'Fit the effective index from CWLs measured at several angles',
    body: { schema: neffRequestSchema },
    responses: { 200: { description: 'n_eff, the normal-incidence CWL and the RMS residual.', schema: r.neffResult }, 400: err('Malformed JSON.'), ...missing, ...invalid },
    // λ(θ) = 656.3·sqrt(1 − sin²θ/2²) at 0, 8 and 16° (docs/model.md §Angle shift).
    example: { body: { measurements: [{ aoiDeg: 0, cwlNm: 656.3 }, { aoiDeg: 8, cwlNm: 654.71 }, { aoiDeg: 16, cwlNm: 650.04 }] } },
  },
  {
    method: 'get', path: '/api/lines', tag: 'Reference', access: 'public',
    summary: 'The emission-line catalogue',
    responses: { 200: { description: 'Every line with its standard-air and vacuum wavelengths.', schema: r.lineList } },
    example: {},
  },
  {
    method: 'get', path: '/api/openapi.json', tag: 'Reference', access: 'public',
    summary: 'This document',
    responses: { 200: { description: 'OpenAPI 3.1.', schema: r.openApiDocument } },
    example: {},
  },
  // ---------------------------------------------------------------- optics
  {
    method: 'get', path: '/api/optics', tag: 'Optics', access: 'public',
    summary: 'The example optics, and a signed-in user\'s own',
    responses: { 200: { description: 'Optics with their derived f-number, obstruction ratio and chief-ray angle.', schema: r.opticList } },
    example: {},
  },
  {
    method: 'post', path: '/api/optics', tag: 'Optics', access: 'contributor',
    summary: 'Save an optic from its hardware or its numbers',
    description: 'Whatever can be derived is (f-number from aperture and focal length, obstruction ratio from the diameters, chief-ray angle from sensor and exit pupil); values that disagree are refused by field.',
    body: { schema: opticInputSchema },
    responses: { 201: { description: 'The saved optic.', schema: r.optic }, 400: err('Malformed JSON.'), ...signedIn, ...invalid },
  },
  {
    method: 'get', path: '/api/optics/{id}', tag: 'Optics', access: 'public',
    summary: 'One optic: an example, or one of your own',
    params: id('Optic'),
    responses: { 200: { description: 'The optic.', schema: r.optic }, ...missing },
  },
  {
    method: 'patch', path: '/api/optics/{id}', tag: 'Optics', access: 'contributor',
    summary: 'Change some fields of your own optic (null clears one)',
    params: id('Optic'),
    body: { schema: z.object(opticRawShape).partial() },
    responses: { 200: { description: 'The optic after the change.', schema: r.optic }, 400: err('Malformed JSON.'), ...signedIn, ...missing, ...invalid },
  },
  {
    method: 'delete', path: '/api/optics/{id}', tag: 'Optics', access: 'contributor',
    summary: 'Delete your own optic',
    params: id('Optic'),
    responses: { 200: { description: 'Deleted.', schema: z.object({ deleted: z.literal(true), id: z.number().int() }) }, ...signedIn, ...missing },
  },
  // ---------------------------------------------------------------- submissions
  {
    method: 'post', path: '/api/submissions', tag: 'Submissions', access: 'contributor',
    summary: 'Upload measured curves (one file, or a multi-angle set) for review',
    description: 'Multipart. The `metadata` field holds JSON of the SubmissionMetadata schema below; several files form one curve set, each file\'s AOI given in `files`. Or JSON `{ metadata, uploads: [uploadId, …] }` naming files already sent to the file store (POST /api/uploads/presign): each is read back and must have the size and SHA-256 announced, else 422 and nothing is stored. Nothing is stored when any file or field is refused.',
    body: { schema: submissionForm, type: 'multipart/form-data' },
    responses: { 201: { description: 'Submitted, with the automatic checks and the new curve ids.', schema: r.submissionCreated }, 400: err('Malformed multipart body.'), ...signedIn, 413: err('A file, or the whole body, is over its limit.'), ...invalid, 429: err('Too many uploads.'), 503: storeDown },
  },
  {
    method: 'post', path: '/api/uploads/presign', tag: 'Submissions', access: 'contributor',
    summary: 'A signed address to send one file straight to the file store',
    description: 'Announce a file by name, size (bytes, 5 MB at most) and SHA-256; PUT its bytes to `url` with `headers` before `expiresAt`, then name `uploadId` in a JSON submission. The file lands under a staging key the server chose; staged files nobody submits are swept after a day. 60 a minute per contributor.',
    body: { schema: presignSchema },
    responses: { 201: { description: 'Where to PUT the file.', schema: r.presigned }, 400: err('Malformed JSON.'), ...signedIn, ...invalid, 429: err('Too many files a minute.'), 503: storeDown },
  },
  {
    method: 'get', path: '/api/submissions', tag: 'Submissions', access: 'contributor',
    summary: 'Your submissions; the whole review queue for a moderator',
    query: z.object({ status: z.string().optional().describe('submitted, changes_requested, verified, rejected') }),
    responses: { 200: { description: 'Submissions, newest first.', schema: r.submissionList }, ...signedIn },
  },
  {
    method: 'get', path: '/api/submissions/{id}', tag: 'Submissions', access: 'contributor',
    summary: 'One submission with its checks, files, notes and history',
    params: id('Submission'),
    responses: { 200: { description: 'The submission.', schema: r.submissionDetail }, ...signedIn, ...missing },
  },
  {
    method: 'post', path: '/api/submissions/{id}/review', tag: 'Submissions', access: 'moderator',
    summary: 'Verify, ask for changes or reject (never your own submission)',
    params: id('Submission'),
    body: { schema: reviewDecisionSchema },
    responses: { 200: { description: 'The new status.', schema: r.reviewResult }, 400: err('Malformed JSON.'), ...signedIn, ...missing, 409: err('The submission is no longer awaiting review.'), ...invalid },
  },
  {
    method: 'post', path: '/api/submissions/{id}/revise', tag: 'Submissions', access: 'contributor',
    summary: 'Send a revised upload after a moderator asked for changes (the submitter only)',
    params: id('Submission'),
    body: { schema: submissionForm, type: 'multipart/form-data' },
    responses: { 200: { description: 'Back in the queue, with fresh checks.', schema: r.submissionCreated }, ...signedIn, ...missing, 409: err('The submission is not waiting for changes.'), 413: err('Over a limit.'), ...invalid, 503: storeDown },
  },
  {
    method: 'post', path: '/api/submissions/{id}/notes', tag: 'Submissions', access: 'contributor',
    summary: 'Add a note to a submission\'s thread',
    params: id('Submission'),
    body: { schema: threadReplySchema },
    responses: { 201: { description: 'The note.', schema: r.note }, 400: err('Malformed JSON.'), ...signedIn, ...missing, ...invalid },
  },
  {
    method: 'get', path: '/api/submissions/{id}/files/{fileId}', tag: 'Submissions', access: 'contributor',
    summary: 'An uploaded file, byte for byte',
    params: z.object({ id: z.string().describe('Submission id'), fileId: z.string().describe('File id') }),
    responses: { 200: { description: 'The raw file; `x-content-sha256` carries its hash.', type: 'text/plain' }, ...signedIn, ...missing, 503: storeDown },
  },
  // ---------------------------------------------------------------- tokens
  {
    method: 'post', path: '/api/tokens', tag: 'Tokens', access: 'contributor',
    summary: 'Create an API token for scripts (from a signed-in session, not with another token)',
    body: { schema: createTokenSchema },
    responses: { 201: { description: 'The token, shown this once.', schema: r.tokenCreated }, 400: err('Malformed JSON.'), ...signedIn, ...invalid },
  },
  {
    method: 'get', path: '/api/tokens', tag: 'Tokens', access: 'contributor',
    summary: 'Your API tokens (never the secrets)',
    responses: { 200: { description: 'Tokens, newest first.', schema: r.tokenList }, ...signedIn },
  },
  {
    method: 'delete', path: '/api/tokens/{id}', tag: 'Tokens', access: 'contributor',
    summary: 'Revoke one of your API tokens',
    params: id('Token'),
    responses: { 200: { description: 'Revoked.', schema: r.flag('revoked') }, ...signedIn, ...missing },
  },
  // ---------------------------------------------------------------- account
  {
    method: 'post', path: '/api/account/register', tag: 'Account', access: 'public',
    summary: 'Create an account; a mail follows (a confirmation link, or to an existing account\'s owner a note that someone tried)',
    body: { schema: registerSchema },
    responses: { 202: { description: 'Accepted: the same answer whether or not the address already has an account.', schema: r.registered }, 400: err('Malformed JSON.'), ...invalid, 429: err('Too many sign-ups from this address.') },
  },
  {
    method: 'delete', path: '/api/account/sessions', tag: 'Account', access: 'contributor',
    summary: 'Sign out everywhere: end every session of your account, this one included',
    responses: { 200: { description: 'How many sessions ended.', schema: r.sessionsEnded }, ...signedIn },
  },
  {
    method: 'post', path: '/api/account/reset', tag: 'Account', access: 'public',
    summary: 'Ask for a password-reset mail (the answer never says whether the address exists)',
    body: { schema: resetRequestSchema },
    responses: { 202: { description: 'Accepted.', schema: r.flag('sent') }, 400: err('Malformed JSON.'), ...invalid, 429: err('Too many requests from this address.') },
  },
  {
    method: 'post', path: '/api/account/reset/confirm', tag: 'Account', access: 'public',
    summary: 'Set a new password with the token from the mail',
    body: { schema: resetConfirmSchema },
    responses: { 200: { description: 'Done.', schema: r.flag('reset') }, 400: err('Malformed JSON.'), ...invalid },
  },
  {
    method: 'patch', path: '/api/admin/users/{id}', tag: 'Admin', access: 'admin',
    summary: 'Change a user\'s role or disable the account',
    params: z.object({ id: z.string().describe('User id (a UUID)') }),
    body: { schema: roleChangeSchema },
    responses: { 200: { description: 'The user after the change.', schema: r.userChanged }, 400: err('Malformed JSON.'), ...signedIn, ...missing, 409: err('An admin cannot demote or disable themself.'), ...invalid },
  },
  // ---------------------------------------------------------------- sign-in (next-auth)
  {
    method: 'get', path: '/api/auth/csrf', tag: 'Sign-in', access: 'public',
    summary: 'Step 1 of a scripted sign-in: a CSRF token (and its cookie)',
    responses: { 200: { description: 'The token.', schema: r.csrf } },
    example: {},
  },
  {
    method: 'post', path: '/api/auth/callback/credentials', tag: 'Sign-in', access: 'public',
    summary: 'Step 2: e-mail and password with the CSRF token; sets the session cookie',
    body: { schema: credentialsForm, type: 'application/x-www-form-urlencoded' },
    responses: { 302: { description: 'Redirect, with the session cookie when the password was right.' } },
  },
  {
    method: 'get', path: '/api/auth/session', tag: 'Sign-in', access: 'public',
    summary: 'The current session (empty when signed out)',
    responses: { 200: { description: 'The session.', schema: r.session } },
    example: {},
  },
];

/** Named schemas the operations refer to in words (multipart fields carry JSON text of these). */
export const API_COMPONENTS: Readonly<Record<string, z.ZodType>> = {
  SubmissionMetadata: submissionMetadataSchema,
  ReaderOptions: readerOptionsSchema,
  Error: r.errorBody,
};
