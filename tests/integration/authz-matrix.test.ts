import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, BASE, json, signIn, type Client } from '../support/http';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

/**
 * Who may do what, for every route handler under app/api. The handlers are found on disk
 * when the test runs, with the methods each file exports, so a new route (or a new method)
 * that is missing from MATRIX below fails the first test. Authorisation is decided on the
 * server (docs/product.md, "Roles"); something the caller may not see answers 404 like a
 * missing row.
 *
 * To add a route: a key (its folder under app/api) and, for each method it exports, one or
 * more cases: how to build the request for a caller, and the status each caller gets.
 */

afterAll(() => closeSequelize());

const WHO = ['visitor', 'contributor', 'other', 'moderator', 'admin', 'token'] as const;
type Who = (typeof WHO)[number];
type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE' | 'HEAD' | 'OPTIONS';
type Statuses = Record<Who, number>;
type Req = { path: string; body?: unknown; form?: FormData };
/** `caller`, when given, sends the request instead of the shared clients (for calls that would end their sessions). */
type Case = { what: string; request: (who: Who) => Promise<Req> | Req; expect: Statuses; caller?: (who: Who) => Promise<Client> };

/** Statuses in the order visitor, contributor (the owner), another contributor, moderator, admin, the owner's API token. */
const S = (visitor: number, contributor: number, other: number, moderator: number, admin: number, token: number): Statuses =>
  ({ visitor, contributor, other, moderator, admin, token });
const ALL = (n: number) => S(n, n, n, n, n, n);

// ---------------------------------------------------------------- the callers and their things

let clients: Record<Who, Client>;
let moderator2: Client;
let verifiedCurveId: number;

const sendJson = (c: Client, method: string, p: string, body?: unknown) =>
  c.fetch(p, { method, headers: { 'content-type': 'application/json', origin: BASE }, body: body === undefined ? undefined : JSON.stringify(body) });

async function ownerSubmission() {
  const res = await clients.contributor.fetch('/api/submissions', {
    method: 'POST', headers: { origin: BASE }, body: submissionForm([singleCurve('matrix.csv')], metadataFor({ label: 'Matrix Hα 3 nm' })),
  });
  expect(res.status).toBe(201);
  const s = await json<{ id: number; curveIds: number[] }>(res);
  const detail = await json<{ files: { id: number }[] }>(await clients.contributor.fetch(`/api/submissions/${s.id}`));
  return { id: s.id, curveId: s.curveIds[0], fileId: detail.files[0].id };
}

async function ownerOptic() {
  const res = await sendJson(clients.contributor, 'POST', '/api/optics', { name: `Matrix scope ${randomUUID().slice(0, 6)}`, fNumber: 4 });
  expect(res.status).toBe(201);
  return (await json<{ id: number }>(res)).id;
}

async function ownerToken() {
  const res = await sendJson(clients.contributor, 'POST', '/api/tokens', { name: 'matrix' });
  expect(res.status).toBe(201);
  return json<{ id: number; token: string }>(res);
}

/** A caller of the same standing as the shared one, but with an account of its own to sign out everywhere. */
async function freshCaller(who: Who): Promise<Client> {
  if (who === 'visitor') return anonymous();
  const role = who === 'moderator' || who === 'admin' ? who : 'contributor';
  const user = await makeUser(role);
  const client = await signIn(user.email, user.password);
  if (who !== 'token') return client;
  const res = await sendJson(client, 'POST', '/api/tokens', { name: 'matrix' });
  const { token } = await json<{ token: string }>(res);
  const base = anonymous();
  return { cookie: '', fetch: (p, init = {}) => base.fetch(p, { ...init, headers: { ...Object.fromEntries(new Headers(init.headers)), authorization: `Bearer ${token}` } }) };
}

async function changesRequested() {
  const s = await ownerSubmission();
  const res = await sendJson(moderator2, 'POST', `/api/submissions/${s.id}/review`, { decision: 'request_changes', note: 'remeasure' });
  expect(res.status).toBe(200);
  return s;
}

const points = { wavelengthNm: [650, 652, 654, 656, 658, 660, 662], transmission: [0.01, 0.1, 0.6, 0.9, 0.6, 0.1, 0.01] };

// ---------------------------------------------------------------- the table

const MATRIX: Record<string, Partial<Record<Method, Case[]>>> = {
  'account/register': {
    // Accepted for anyone, whether or not the address has an account (the answer never tells).
    POST: [{ what: 'sign-up with a new address', request: () => ({ path: '/api/account/register', body: { email: `m-${randomUUID().slice(0, 8)}@bandcone.test`, name: 'Matrix', password: 'a long enough password' } }), expect: ALL(202) }],
  },
  'account/sessions': {
    DELETE: [{ what: 'sign out everywhere', request: () => ({ path: '/api/account/sessions' }), expect: S(401, 200, 200, 200, 200, 200), caller: freshCaller }],
  },
  'account/reset': {
    POST: [{ what: 'ask for a reset link', request: () => ({ path: '/api/account/reset', body: { email: 'nobody@bandcone.test' } }), expect: ALL(202) }],
  },
  'account/reset/confirm': {
    POST: [{ what: 'an unknown reset token', request: () => ({ path: '/api/account/reset/confirm', body: { token: 'x'.repeat(43), password: 'a long enough password' } }), expect: ALL(422) }],
  },
  'admin/users/[id]': {
    PATCH: [{
      what: 'change a user’s role',
      request: async () => ({ path: `/api/admin/users/${(await makeUser()).id}`, body: { role: 'contributor' } }),
      expect: S(401, 403, 403, 403, 200, 403),
    }],
  },
  'auth/[...nextauth]': {
    GET: [{ what: 'the CSRF token', request: () => ({ path: '/api/auth/csrf' }), expect: ALL(200) }],
    POST: [{ what: 'sign out without the CSRF token', request: () => ({ path: '/api/auth/signout', body: {} }), expect: ALL(302) }],
  },
  'curves': {
    GET: [
      { what: 'search verified curves', request: () => ({ path: '/api/curves?pageSize=1' }), expect: ALL(200) },
      { what: 'filter by a status other than verified (a contributor sees their own)', request: () => ({ path: '/api/curves?status=submitted&pageSize=1' }), expect: S(403, 200, 200, 200, 200, 200) },
    ],
  },
  'curves/[id]': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/[id]/cite': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}/cite` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}/cite` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/[id]/jcamp': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}/jcamp` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}/jcamp` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/[id]/votable': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}/votable` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}/votable` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/[id]/csv': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}/csv` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}/csv` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/[id]/json': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}/json` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}/json` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/[id]/points': {
    GET: [
      { what: 'a verified curve', request: () => ({ path: `/api/curves/${verifiedCurveId}/points` }), expect: ALL(200) },
      { what: 'the owner’s unreviewed curve', request: async () => ({ path: `/api/curves/${(await ownerSubmission()).curveId}/points` }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'curves/export.csv': { GET: [{ what: 'bulk CSV', request: () => ({ path: '/api/curves/export.csv?line=Ha' }), expect: ALL(200) }] },
  'curves/export.json': { GET: [{ what: 'bulk JSON', request: () => ({ path: '/api/curves/export.json?line=Ha' }), expect: ALL(200) }] },
  'curves/preview': { POST: [{ what: 'preview points', request: () => ({ path: '/api/curves/preview', body: { points } }), expect: ALL(200) }] },
  'lines': { GET: [{ what: 'the emission lines', request: () => ({ path: '/api/lines' }), expect: ALL(200) }] },
  'model/cone': {
    POST: [
      { what: 'the cone model on sent points', request: () => ({ path: '/api/model/cone', body: { points, optic: { fNumber: 4, obstruction: 0 }, nEff: 2, lines: ['Ha'] } }), expect: ALL(200) },
      { what: 'the cone model on the owner’s unreviewed curve', request: async () => ({ path: '/api/model/cone', body: { curveId: (await ownerSubmission()).curveId, optic: { fNumber: 4, obstruction: 0 }, nEff: 2, lines: ['Ha'] } }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'model/field-map': {
    POST: [
      { what: 'a sensor map of sent points', request: () => ({ path: '/api/model/field-map', body: { points, optic: { fNumber: 4, obstruction: 0 }, sensor: { widthMm: 12, heightMm: 9 }, exitPupilMm: 60, nEff: 2, lineNm: 656.28, grid: { nx: 8, ny: 6 } } }), expect: ALL(200) },
      { what: 'a sensor map of the owner’s unreviewed curve', request: async () => ({ path: '/api/model/field-map', body: { curveId: (await ownerSubmission()).curveId, optic: { fNumber: 4, obstruction: 0 }, sensor: { widthMm: 12, heightMm: 9 }, exitPupilMm: 60, nEff: 2, lineNm: 656.28, grid: { nx: 8, ny: 6 } } }), expect: S(404, 200, 404, 200, 200, 200) },
    ],
  },
  'labels/odds': {
    // Public: it reads verified curves only; a label with fewer than three units answers with a reason.
    GET: [{ what: 'odds for a label', request: () => ({ path: '/api/labels/odds?label=No%20such%20label&fNumber=4&obstruction=0&minThroughput=0.8&line=Ha' }), expect: ALL(200) }],
  },
  'model/neff': {
    POST: [{ what: 'fit from CWLs', request: () => ({ path: '/api/model/neff', body: { measurements: [{ aoiDeg: 0, cwlNm: 656.3 }, { aoiDeg: 10, cwlNm: 655.3 }] } }), expect: ALL(200) }],
  },
  'openapi.json': {
    GET: [{ what: 'the API description', request: () => ({ path: '/api/openapi.json' }), expect: ALL(200) }],
  },
  'optics': {
    GET: [{ what: 'list optics', request: () => ({ path: '/api/optics' }), expect: ALL(200) }],
    POST: [{ what: 'save an optic', request: () => ({ path: '/api/optics', body: { name: 'Matrix optic', fNumber: 5 } }), expect: S(401, 201, 201, 201, 201, 201) }],
  },
  'optics/[id]': {
    GET: [{ what: 'the owner’s private optic', request: async () => ({ path: `/api/optics/${await ownerOptic()}` }), expect: S(404, 200, 404, 404, 404, 200) }],
    PATCH: [{ what: 'rename the owner’s optic', request: async () => ({ path: `/api/optics/${await ownerOptic()}`, body: { name: 'renamed' } }), expect: S(401, 200, 404, 404, 404, 200) }],
    DELETE: [{ what: 'delete the owner’s optic', request: async () => ({ path: `/api/optics/${await ownerOptic()}` }), expect: S(401, 200, 404, 404, 404, 200) }],
  },
  'submissions': {
    GET: [{ what: 'list submissions', request: () => ({ path: '/api/submissions' }), expect: S(401, 200, 200, 200, 200, 200) }],
    POST: [{ what: 'submit a curve', request: () => ({ path: '/api/submissions', form: submissionForm([singleCurve('new.csv')], metadataFor()) }), expect: S(401, 201, 201, 201, 201, 201) }],
  },
  'submissions/[id]': {
    GET: [{ what: 'the owner’s submission', request: async () => ({ path: `/api/submissions/${(await ownerSubmission()).id}` }), expect: S(401, 200, 404, 200, 200, 200) }],
  },
  'submissions/[id]/files/[fileId]': {
    GET: [{ what: 'the owner’s raw file', request: async () => { const s = await ownerSubmission(); return { path: `/api/submissions/${s.id}/files/${s.fileId}` }; }, expect: S(401, 200, 404, 200, 200, 200) }],
  },
  'submissions/[id]/notes': {
    POST: [{ what: 'a note on the owner’s submission', request: async () => ({ path: `/api/submissions/${(await ownerSubmission()).id}/notes`, body: { body: 'a question' } }), expect: S(401, 201, 404, 201, 201, 201) }],
  },
  'submissions/[id]/review': {
    POST: [{ what: 'verify the owner’s submission', request: async () => ({ path: `/api/submissions/${(await ownerSubmission()).id}/review`, body: { decision: 'verify', note: '' } }), expect: S(401, 403, 403, 200, 200, 403) }],
  },
  'submissions/[id]/revise': {
    POST: [{
      what: 'revise the owner’s submission after changes were requested',
      request: async () => ({ path: `/api/submissions/${(await changesRequested()).id}/revise`, form: submissionForm([singleCurve('fixed.csv')], metadataFor()) }),
      expect: S(401, 200, 404, 403, 403, 200),
    }],
  },
  'uploads/presign': {
    POST: [{
      what: 'a signed address for one file',
      request: () => ({ path: '/api/uploads/presign', body: { name: 'matrix.csv', size: 120, sha256: 'ab'.repeat(32) } }),
      expect: S(401, 201, 201, 201, 201, 201),
    }],
  },
  'tokens': {
    GET: [{ what: 'list tokens', request: () => ({ path: '/api/tokens' }), expect: S(401, 200, 200, 200, 200, 200) }],
    POST: [{ what: 'create a token', request: () => ({ path: '/api/tokens', body: { name: 'matrix' } }), expect: S(401, 201, 201, 201, 201, 403) }],
  },
  'tokens/[id]': {
    DELETE: [{ what: 'revoke another of the owner’s tokens', request: async () => ({ path: `/api/tokens/${(await ownerToken()).id}` }), expect: S(401, 200, 404, 404, 404, 200) }],
  },
};

// ---------------------------------------------------------------- the routes on disk

const API_DIR = path.resolve(import.meta.dirname, '../../app/api');
const METHODS: Method[] = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'HEAD', 'OPTIONS'];

/** Every route.ts under app/api, keyed by its folder, with the HTTP methods the file exports. */
function routesOnDisk(): Map<string, Method[]> {
  const out = new Map<string, Method[]>();
  for (const rel of fs.readdirSync(API_DIR, { recursive: true }) as string[]) {
    if (!/(^|[/\\])route\.(ts|tsx|js|mjs)$/.test(rel)) continue;
    const key = path.dirname(rel).split(path.sep).join('/');
    const text = fs.readFileSync(path.join(API_DIR, rel), 'utf8');
    const found = METHODS.filter(
      (m) =>
        new RegExp(`export\\s+(const|let|var)\\s+${m}\\b`).test(text) ||
        new RegExp(`export\\s+(async\\s+)?function\\s+${m}\\b`).test(text) ||
        new RegExp(`export\\s*\\{[^}]*\\bas\\s+${m}\\b[^}]*\\}`).test(text) ||
        new RegExp(`export\\s*\\{[^}]*(^|[\\s,{])${m}\\s*[,}]`).test(text),
    );
    out.set(key, found);
  }
  return out;
}

// ---------------------------------------------------------------- the test

beforeAll(async () => {
  const owner = await signIn('contributor@bandcone.test');
  const base = anonymous();
  clients = {
    visitor: base,
    contributor: owner,
    other: await signIn('contributor2@bandcone.test'),
    moderator: await signIn('moderator@bandcone.test'),
    admin: await signIn('admin@bandcone.test'),
    token: base, // replaced below, once the owner has a token
  };
  moderator2 = await signIn('moderator2@bandcone.test');
  const { token } = await ownerToken();
  clients.token = {
    cookie: '',
    fetch: (p, init = {}) => base.fetch(p, { ...init, headers: { ...Object.fromEntries(new Headers(init.headers)), authorization: `Bearer ${token}` } }),
  };
  const list = await json<{ items: { id: number }[] }>(await base.fetch('/api/curves?pageSize=1'));
  verifiedCurveId = list.items[0].id;
});

describe('every route handler under app/api is in the matrix', () => {
  it('finds the routes on disk', () => {
    expect(routesOnDisk().size).toBeGreaterThanOrEqual(20);
  });

  it('has a row for each exported method, and no row for a route or method that is gone', () => {
    const disk = routesOnDisk();
    const onDisk = [...disk].flatMap(([route, methods]) => methods.map((m) => `${m} ${route}`)).sort();
    const inTable = Object.entries(MATRIX).flatMap(([route, byMethod]) => Object.keys(byMethod).map((m) => `${m} ${route}`)).sort();
    expect(inTable).toEqual(onDisk);
    for (const [route, methods] of disk) expect([route, methods.length > 0]).toEqual([route, true]);
  });
});

const cases = Object.entries(MATRIX).flatMap(([route, byMethod]) =>
  Object.entries(byMethod).flatMap(([method, list]) => (list ?? []).map((c) => ({ route, method, c }))),
);

describe.each(cases)('$method /api/$route: $c.what', ({ method, c }) => {
  it.each([...WHO])('%s', async (who) => {
    const req = await c.request(who);
    const headers: Record<string, string> = { origin: BASE };
    let body: BodyInit | undefined;
    if (req.form) body = req.form;
    else if (req.body !== undefined) {
      headers['content-type'] = 'application/json';
      body = JSON.stringify(req.body);
    }
    const res = await (c.caller ? await c.caller(who) : clients[who]).fetch(req.path, { method, headers, body });
    const text = await res.text();
    expect({ who, status: res.status }, text.slice(0, 300)).toEqual({ who, status: c.expect[who] });
  });
});
