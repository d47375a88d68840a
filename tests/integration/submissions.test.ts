import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { rawKey, readCapped } from '@/lib/storage/objects';

/** A stored raw file's bytes as text, read from the file store (raw/<sha256>). */
async function storedText(sha256: string): Promise<string> {
  const got = await readCapped(rawKey(sha256), 10 * 1024 * 1024);
  if (!got || !('bytes' in got)) throw new Error(`raw/${sha256} is not in the file store`);
  return got.bytes.toString('utf8');
}
import { angleScale, curveCsv, HA_NM, metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

afterAll(() => closeSequelize());

type Who = 'anonymous' | 'owner' | 'other' | 'moderator' | 'admin' | 'token';

/**
 * Everything a refused request could have touched. Compared before and after each
 * refusal: counts alone would miss an update, so the state columns are hashed too.
 */
async function tables() {
  const [row] = await query<Record<string, string>>(`SELECT
    (SELECT count(*) FROM submissions)::text AS submissions,
    (SELECT md5(coalesce(string_agg(id || ':' || status || ':' || revision || ':' || updated_at::text || ':' || md5(metadata::text), ',' ORDER BY id), '')) FROM submissions) AS submissions_state,
    (SELECT count(*) FROM submission_files)::text AS files,
    (SELECT count(*) FROM curves)::text AS curves,
    (SELECT md5(coalesce(string_agg(id || ':' || status, ',' ORDER BY id), '')) FROM curves) AS curves_state,
    (SELECT count(*) FROM reviews)::text AS reviews,
    (SELECT count(*) FROM audit_events)::text AS audit,
    (SELECT count(*) FROM api_tokens)::text AS tokens,
    (SELECT md5(coalesce(string_agg(id || ':' || coalesce(revoked_at::text, '-'), ',' ORDER BY id), '')) FROM api_tokens) AS tokens_state`);
  return row;
}

/** Sends the request, expects the status and an error body (docs/api.md §Errors), and proves nothing was written. */
async function refused(send: () => Promise<Response>, status: number, message?: RegExp) {
  const before = await tables();
  const res = await send();
  const body = await json(res);
  expect({ status: res.status, error: typeof body.error }).toEqual({ status, error: 'string' });
  if (message) expect(body.error).toMatch(message);
  expect(Array.isArray(body.details)).toBe(true);
  expect(await tables()).toEqual(before);
  return body as { error: string; details: { line?: number; field?: string; message: string }[] };
}

const post = (client: Client, path: string, body: unknown) =>
  client.fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

const bearer = (token: string): Client => {
  const base = anonymous();
  return { cookie: '', fetch: (path, init = {}) => base.fetch(path, { ...init, headers: { ...Object.fromEntries(new Headers(init.headers)), authorization: `Bearer ${token}` } }) };
};

let owner: Client;
let other: Client;
let moderator: Client;
let moderator2: Client;
let admin: Client;
let token: Client;
let ownerId: string;
let ownerEmail: string;
let clients: Record<Who, Client>;

async function submit(client: Client, files = [singleCurve()], metadata: unknown = metadataFor()) {
  const res = await client.fetch('/api/submissions', { method: 'POST', body: submissionForm(files, metadata) });
  expect(res.status).toBe(201);
  return json<{ id: number; status: string; checks: { code: string; level: string; message: string }[]; curveIds: number[] }>(res);
}

beforeAll(async () => {
  const o = await makeUser('contributor');
  const x = await makeUser('contributor');
  ownerId = o.id;
  ownerEmail = o.email;
  owner = await signIn(o.email, o.password);
  other = await signIn(x.email, x.password);
  moderator = await signIn('moderator@bandcone.test');
  moderator2 = await signIn('moderator2@bandcone.test');
  admin = await signIn('admin@bandcone.test');
  const created = await json<{ token: string }>(await post(owner, '/api/tokens', { name: 'integration bench' }));
  token = bearer(created.token);
  clients = { anonymous: anonymous(), owner, other, moderator, admin, token };
});

describe('POST /api/submissions', () => {
  it('takes a two-angle set in one request and stores the raw bytes, the curves and the checks together', async () => {
    const files = [0, 15].map((aoi) => ({ name: `set-aoi${aoi}.csv`, text: curveCsv({ aoiDeg: aoi, nEff: 2, noiseSeed: Date.now() % 100000 + aoi }) }));
    const result = await submit(owner, files, metadataFor({ files: [{ name: 'set-aoi0.csv', aoiDeg: 0 }, { name: 'set-aoi15.csv', aoiDeg: 15 }] }));
    expect(result.status).toBe('submitted');
    expect(result.curveIds).toHaveLength(2);
    const curves = await query<{ aoi_deg: number; cwl_nm: number; n_eff: number; status: string }>(`SELECT aoi_deg, cwl_nm, n_eff, status FROM curves WHERE submission_id = :id ORDER BY aoi_deg`, { id: result.id });
    // docs/model.md §Angle shift: the passband measured at 15° sits at 656.3 nm · sqrt(1 − sin²15°/2²).
    expect(curves.map((c) => c.cwl_nm)).toEqual([expect.closeTo(HA_NM, 1), expect.closeTo(HA_NM * angleScale(15, 2), 1)]);
    // docs/model.md §Effective index recovers the index the files were generated with.
    expect(curves[0].n_eff).toBeCloseTo(2, 1);
    expect(curves.every((c) => c.status === 'submitted')).toBe(true);
    const stored = await query<{ original_name: string; sha256: string }>(`SELECT original_name, sha256 FROM submission_files WHERE submission_id = :id ORDER BY aoi_deg`, { id: result.id });
    for (const [i, f] of stored.entries()) {
      expect(f.original_name).toBe(files[i].name);
      expect(await storedText(f.sha256)).toBe(files[i].text);
      expect(f.sha256).toBe(createHash('sha256').update(files[i].text).digest('hex'));
    }
    expect(result.checks.map((c) => c.code)).toEqual(expect.arrayContaining(['cwl-nominal', 'coverage']));
    const [audit] = await query<{ n: number }>(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'submission.created' AND target_id = :id`, { id: String(result.id) });
    expect(audit.n).toBe(1);
  });

  it('honours the reader overrides chosen in the preview', async () => {
    // A fraction file forced to be read as percent: the stored peak must be 0.9 % rather than 90 %.
    const name = 'forced-percent.csv';
    const metadata = metadataFor({ files: [{ name, aoiDeg: 0, reader: { transmissionUnit: 'percent' } }] });
    const result = await submit(owner, [singleCurve(name)], metadata);
    const [curve] = await query<{ peak_t: number }>(`SELECT peak_t FROM curves WHERE submission_id = :id`, { id: result.id });
    expect(curve.peak_t).toBeCloseTo(0.009, 4);
    expect(result.checks.map((c) => c.code)).toContain('peak-low');
  });

  it('any signed-in role from contributor up may submit', async () => {
    for (const who of ['other', 'moderator', 'admin'] as const) {
      const result = await submit(clients[who]);
      expect([who, result.status]).toEqual([who, 'submitted']);
    }
  });

  it('works with a bearer token, as a bench script sends it', async () => {
    const result = await submit(token);
    const [row] = await query<{ contributor_id: string }>(`SELECT contributor_id FROM submissions WHERE id = :id`, { id: result.id });
    expect(row.contributor_id).toBe(ownerId);
  });

  it('refuses anonymous callers (401), and a revoked token (401)', async () => {
    await refused(() => anonymous().fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve()], metadataFor()) }), 401);
    await refused(() => bearer('bct_not_a_real_token').fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve()], metadataFor()) }), 401, /token/i);
  });

  it('refuses a file over 5 MB and a 21st file with 413', async () => {
    const big = { name: 'big.csv', text: 'wavelength,T\n' + '656.000,0.500000\n'.repeat(330_000) };
    expect(big.text.length).toBeGreaterThan(5 * 1024 * 1024);
    await refused(() => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm([big], metadataFor()) }), 413, /5 MB/);
    const many = Array.from({ length: 21 }, (_, i) => singleCurve(`f${i}.csv`));
    await refused(() => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm(many, metadataFor()) }), 413, /20 files/);
  });

  it('refuses more than 200 000 rows with 413 naming the line', async () => {
    const rows = Array.from({ length: 200_010 }, (_, i) => `${(400 + i * 0.002).toFixed(3)},0.5`).join('\n');
    const body = await refused(() => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm([{ name: 'long.csv', text: rows }], metadataFor()) }), 413, /long\.csv/);
    expect(body.details[0].line).toBeGreaterThan(200_000);
  });

  it('refuses an unreadable file with 422 and the line number, even when the other file of the set is fine', async () => {
    const lines = curveCsv({ noiseSeed: 5 }).split('\n');
    lines[41] = '658.000,not-a-number';
    const bad = { name: 'bad-aoi10.csv', text: lines.join('\n') };
    const body = await refused(
      () => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve('good-aoi0.csv'), bad], metadataFor({ files: [{ name: 'good-aoi0.csv', aoiDeg: 0 }, { name: 'bad-aoi10.csv', aoiDeg: 10 }] })) }),
      422,
      /bad-aoi10\.csv/,
    );
    expect(body.details).toEqual(expect.arrayContaining([expect.objectContaining({ line: 42, message: expect.stringContaining('bad-aoi10.csv') })]));
  });

  it('refuses bad metadata with 422 naming each field, and malformed bodies with 400', async () => {
    const body = await refused(() => owner.fetch('/api/submissions', {
      method: 'POST',
      body: submissionForm([singleCurve()], metadataFor({ label: '', method: { instrument: 'spectrophotometer', resolutionNm: 0.1, beam: 'converging', aoiDeg: 0 } })),
    }), 422);
    expect(body.details.map((d) => d.field)).toEqual(expect.arrayContaining(['label', 'method.beamFNumber']));
    const set = await refused(() => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve('a.csv'), singleCurve('b.csv')], metadataFor()) }), 422, /AOI/);
    expect(set.details[0].field).toBe('files');
    await refused(() => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve()], '{not json') }), 400, /metadata/);
    await refused(() => owner.fetch('/api/submissions', { method: 'POST', body: submissionForm([], metadataFor()) }), 400, /file/);
    await refused(() => post(owner, '/api/submissions', metadataFor()), 400, /multipart/);
  });
});

describe('reading submissions: every role', () => {
  let mine: { id: number };
  let fileId: number;
  let sent: string;
  beforeAll(async () => {
    const f = singleCurve('read-me.csv');
    sent = f.text as string;
    mine = await submit(owner, [f]);
    [{ id: fileId }] = await query<{ id: number }>(`SELECT id FROM submission_files WHERE submission_id = :id`, { id: mine.id });
  });

  it('GET /api/submissions: 401 anonymous; own only for contributors and tokens; the whole queue for moderators and admins', async () => {
    await refused(() => anonymous().fetch('/api/submissions'), 401);
    for (const who of ['owner', 'token'] as const) {
      const list = await json<{ items: { id: number; contributorId: string }[]; total: number }>(await clients[who].fetch('/api/submissions'));
      expect(list.items.map((i) => i.id)).toContain(mine.id);
      expect(new Set(list.items.map((i) => i.contributorId))).toEqual(new Set([ownerId]));
      expect(list.total).toBe(list.items.length);
    }
    const others = await json<{ items: { id: number }[] }>(await other.fetch('/api/submissions'));
    expect(others.items.map((i) => i.id)).not.toContain(mine.id);
    for (const who of ['moderator', 'admin'] as const) {
      const queue = await json<{ items: { id: number; contributorId: string }[] }>(await clients[who].fetch('/api/submissions?status=submitted'));
      expect(queue.items.map((i) => i.id)).toContain(mine.id);
      expect(new Set(queue.items.map((i) => i.contributorId)).size).toBeGreaterThan(1);
    }
    await refused(() => moderator.fetch('/api/submissions?status=lost'), 422, /status/);
  });

  it('GET /api/submissions/:id: the owner, a token, moderators and admins read it; another contributor gets 404 like a missing id', async () => {
    const expected: Record<Who, number> = { anonymous: 401, owner: 200, other: 404, moderator: 200, admin: 200, token: 200 };
    for (const who of Object.keys(expected) as Who[]) {
      const res = await clients[who].fetch(`/api/submissions/${mine.id}`);
      expect([who, res.status]).toEqual([who, expected[who]]);
      if (res.status === 200) {
        const s = await json(res);
        expect(s.files[0]).toMatchObject({ name: 'read-me.csv', sha256: createHash('sha256').update(sent).digest('hex') });
        expect(s.checks.length).toBeGreaterThan(0);
        expect(Array.isArray(s.thread)).toBe(true);
      }
    }
    await refused(() => owner.fetch('/api/submissions/999999999'), 404);
    await refused(() => owner.fetch('/api/submissions/abc'), 404);
  });

  it('GET …/files/:fileId returns the bytes exactly as uploaded to the same people, 404 for a file of another submission', async () => {
    const expected: Record<Who, number> = { anonymous: 401, owner: 200, other: 404, moderator: 200, admin: 200, token: 200 };
    for (const who of Object.keys(expected) as Who[]) {
      const res = await clients[who].fetch(`/api/submissions/${mine.id}/files/${fileId}`);
      expect([who, res.status]).toEqual([who, expected[who]]);
      if (res.status === 200) {
        expect(await res.text()).toBe(sent);
        expect(res.headers.get('x-content-sha256')).toBe(createHash('sha256').update(sent).digest('hex'));
        expect(res.headers.get('content-disposition')).toContain('read-me.csv');
      }
    }
    const elsewhere = await submit(owner);
    await refused(() => owner.fetch(`/api/submissions/${elsewhere.id}/files/${fileId}`), 404);
  });
});

describe('the thread: POST /api/submissions/:id/notes', () => {
  it('the owner and moderators write; others are refused; each note mails the other side', async () => {
    const s = await submit(owner);
    await refused(() => post(anonymous(), `/api/submissions/${s.id}/notes`, { body: 'hello' }), 401);
    await refused(() => post(other, `/api/submissions/${s.id}/notes`, { body: 'hello' }), 404);
    await refused(() => post(owner, `/api/submissions/${s.id}/notes`, { body: '   ' }), 422);
    await refused(() => post(owner, '/api/submissions/999999999/notes', { body: 'hello' }), 404);
    for (const [who, kind] of [['moderator', 'note'], ['owner', 'reply'], ['admin', 'note'], ['token', 'reply']] as const) {
      const res = await post(clients[who], `/api/submissions/${s.id}/notes`, { body: `from ${who}` });
      expect([who, res.status]).toEqual([who, 201]);
      expect((await json(res)).kind).toBe(kind);
    }
    const thread = await query<{ kind: string; body: string }>(`SELECT kind, body FROM reviews WHERE submission_id = :id ORDER BY id`, { id: s.id });
    expect(thread.map((t) => t.body)).toEqual(['from moderator', 'from owner', 'from admin', 'from token']);
    // The contributor hears of the moderators' notes; the moderators who wrote hear of the replies.
    const deadline = Date.now() + 10_000;
    let toOwner: { text_body: string }[] = [];
    let toModerator: { text_body: string }[] = [];
    while (Date.now() < deadline && (toOwner.length < 2 || toModerator.length < 2)) {
      toOwner = await query<{ text_body: string }>(`SELECT text_body FROM mail_messages WHERE :email = ANY(envelope_to) AND subject LIKE 'New note%' AND text_body LIKE :link`, { email: ownerEmail, link: `%/account/submissions/${s.id}%` });
      toModerator = await query<{ text_body: string }>(`SELECT text_body FROM mail_messages WHERE 'moderator@bandcone.test' = ANY(envelope_to) AND subject LIKE 'New note%' AND text_body LIKE :link`, { link: `%/review/${s.id}%` });
      await new Promise((r) => setTimeout(r, 200));
    }
    expect(toOwner.map((m) => m.text_body)).toEqual(expect.arrayContaining([expect.stringContaining('from moderator'), expect.stringContaining('from admin')]));
    expect(toModerator.map((m) => m.text_body)).toEqual(expect.arrayContaining([expect.stringContaining('from owner'), expect.stringContaining('from token')]));
  });
});

describe('decisions: POST /api/submissions/:id/review', () => {
  it('only moderators and admins decide, never on their own submission, and a note is required unless verifying', async () => {
    const s = await submit(owner);
    for (const who of ['anonymous', 'owner', 'other', 'token'] as const) {
      await refused(() => post(clients[who], `/api/submissions/${s.id}/review`, { decision: 'verify', note: '' }), who === 'anonymous' ? 401 : 403);
    }
    await refused(() => post(moderator, `/api/submissions/${s.id}/review`, { decision: 'reject', note: '' }), 422, /why/i);
    await refused(() => post(moderator, `/api/submissions/${s.id}/review`, { decision: 'publish', note: 'x' }), 422);
    await refused(() => post(moderator, '/api/submissions/999999999/review', { decision: 'verify', note: '' }), 404);
    const modUser = (await query<{ id: string }>(`SELECT id FROM users WHERE email = 'moderator@bandcone.test'`))[0];
    const ownByModerator = await submit(moderator);
    expect((await query<{ contributor_id: string }>(`SELECT contributor_id FROM submissions WHERE id = :id`, { id: ownByModerator.id }))[0].contributor_id).toBe(modUser.id);
    await refused(() => post(moderator, `/api/submissions/${ownByModerator.id}/review`, { decision: 'verify', note: '' }), 403, /another moderator/);
    const res = await post(admin, `/api/submissions/${s.id}/review`, { decision: 'verify', note: 'Looks right.' });
    expect(res.status).toBe(200);
    expect(await json(res)).toEqual({ id: s.id, status: 'verified' });
    // A decision on a submission that is no longer waiting is stale.
    await refused(() => post(moderator, `/api/submissions/${s.id}/review`, { decision: 'reject', note: 'too late' }), 409);
  });

  it('two moderators deciding at once: exactly one wins, the other gets 409', async () => {
    const s = await submit(owner);
    const [a, b] = await Promise.all([
      post(moderator, `/api/submissions/${s.id}/review`, { decision: 'verify', note: 'fine' }),
      post(moderator2, `/api/submissions/${s.id}/review`, { decision: 'reject', note: 'not fine' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const winner = a.status === 200 ? 'verified' : 'rejected';
    const loser = await json(a.status === 409 ? a : b);
    expect(loser.error).toMatch(/already/);
    const decisions = await query<{ kind: string }>(`SELECT kind FROM reviews WHERE submission_id = :id AND kind IN ('verify', 'reject', 'request_changes')`, { id: s.id });
    expect(decisions).toHaveLength(1);
    const [row] = await query<{ status: string }>(`SELECT status FROM submissions WHERE id = :id`, { id: s.id });
    expect(row.status).toBe(winner);
    const curves = await query<{ status: string }>(`SELECT status FROM curves WHERE submission_id = :id`, { id: s.id });
    expect(curves.every((c) => c.status === winner)).toBe(true);
  });
});

describe('revisions: POST /api/submissions/:id/revise', () => {
  it('only the owner revises, only after changes were requested; old revisions stay on record', async () => {
    const s = await submit(owner);
    const revise = (who: Who, files = [singleCurve('fixed.csv')], metadata: unknown = metadataFor({ notes: 'remeasured' })) =>
      clients[who].fetch(`/api/submissions/${s.id}/revise`, { method: 'POST', body: submissionForm(files, metadata) });
    // Still waiting: nothing to revise yet.
    await refused(() => revise('owner'), 409, /changes requested/);
    expect((await post(moderator, `/api/submissions/${s.id}/review`, { decision: 'request_changes', note: 'Please remeasure.' })).status).toBe(200);
    await refused(() => revise('anonymous'), 401);
    await refused(() => revise('other'), 404);
    await refused(() => revise('moderator'), 403);
    await refused(() => revise('admin'), 403);
    const lines = curveCsv({ noiseSeed: 77 }).split('\n');
    lines[9] = 'oops';
    const badFile = await refused(() => revise('owner', [{ name: 'broken.csv', text: lines.join('\n') }]), 422, /broken\.csv/);
    expect(badFile.details[0].line).toBe(10);
    await refused(() => revise('owner', [singleCurve()], metadataFor({ nominalCwlNm: 'red' })), 422);
    await refused(() => revise('owner', [{ name: 'big.csv', text: 'x'.repeat(5 * 1024 * 1024 + 10) }]), 413);

    const res = await revise('token');
    expect(res.status).toBe(200);
    expect(await json(res)).toMatchObject({ id: s.id, status: 'submitted', revision: 2 });
    const curves = await query<{ revision: number; status: string }>(`SELECT revision, status FROM curves WHERE submission_id = :id ORDER BY id`, { id: s.id });
    expect(curves).toEqual([{ revision: 1, status: 'superseded' }, { revision: 2, status: 'submitted' }]);
    const files = await query<{ revision: number }>(`SELECT revision FROM submission_files WHERE submission_id = :id ORDER BY id`, { id: s.id });
    expect(files.map((f) => f.revision)).toEqual([1, 2]);
    // Sent again while waiting: 409.
    await refused(() => revise('owner'), 409);
  });

  it('a metadata-only revision keeps the files of the previous revision', async () => {
    const f = singleCurve('kept.csv');
    const s = await submit(owner, [f]);
    await post(moderator, `/api/submissions/${s.id}/review`, { decision: 'request_changes', note: 'Add the temperature.' });
    const form = new FormData();
    form.append('metadata', JSON.stringify(metadataFor({ method: { ...metadataFor().method, temperatureC: 22 } })));
    const res = await owner.fetch(`/api/submissions/${s.id}/revise`, { method: 'POST', body: form });
    expect(res.status).toBe(200);
    const latest = await query<{ sha256: string; revision: number }>(`SELECT sha256, revision FROM submission_files WHERE submission_id = :id ORDER BY id DESC LIMIT 1`, { id: s.id });
    expect(latest[0].revision).toBe(2);
    expect(await storedText(latest[0].sha256)).toBe(f.text);
    const [row] = await query<{ t: string }>(`SELECT metadata->'method'->>'temperatureC' AS t FROM submissions WHERE id = :id`, { id: s.id });
    expect(row.t).toBe('22');
  });
});

describe('e-mail on every decision and note', () => {
  it('mails the contributor the decision with its note, and a link back', async () => {
    const u = await makeUser('contributor');
    const c = await signIn(u.email, u.password);
    const s = await submit(c, [singleCurve()], metadataFor({ label: 'Mail check Hα' }));
    await post(moderator, `/api/submissions/${s.id}/review`, { decision: 'request_changes', note: 'Which lab measured it?' });
    const deadline = Date.now() + 10_000;
    let mail: { subject: string; text_body: string } | undefined;
    while (!mail && Date.now() < deadline) {
      [mail] = await query<{ subject: string; text_body: string }>(`SELECT subject, text_body FROM mail_messages WHERE :email = ANY(envelope_to) ORDER BY id DESC LIMIT 1`, { email: u.email });
      if (!mail) await new Promise((r) => setTimeout(r, 200));
    }
    expect(mail?.subject).toMatch(/Mail check Hα.*request for changes/);
    expect(mail?.text_body).toContain('Which lab measured it?');
    expect(mail?.text_body).toContain(`/account/submissions/${s.id}`);
  });

  it('mails a verified submission with its S- id and a link to the public curve, not only to the submission', async () => {
    const u = await makeUser('contributor');
    const c = await signIn(u.email, u.password);
    const s = await submit(c, [singleCurve()], metadataFor({ label: 'Published link check' }));
    const res = await post(moderator, `/api/submissions/${s.id}/review`, { decision: 'verify', note: '' });
    expect(res.status).toBe(200);
    const [curve] = await query<{ id: number }>(`SELECT id FROM curves WHERE submission_id = :id AND status = 'verified'`, { id: s.id });
    const deadline = Date.now() + 10_000;
    let mail: { subject: string; text_body: string } | undefined;
    while (!mail && Date.now() < deadline) {
      [mail] = await query<{ subject: string; text_body: string }>(`SELECT subject, text_body FROM mail_messages WHERE :email = ANY(envelope_to) AND subject LIKE '%verified and published%' ORDER BY id DESC LIMIT 1`, { email: u.email });
      if (!mail) await new Promise((r) => setTimeout(r, 200));
    }
    expect(mail?.subject).toContain(`S-${s.id} "Published link check"`);
    // the public page comes first, the thread after
    const body = mail?.text_body ?? '';
    expect(body).toContain(`/curves/${curve.id}\n`);
    expect(body.indexOf(`/curves/${curve.id}`)).toBeLessThan(body.indexOf(`/account/submissions/${s.id}`));
    // a submission number never passes for a curve number
    expect(body).not.toMatch(new RegExp(`#${s.id}\\b`));
  });
});
