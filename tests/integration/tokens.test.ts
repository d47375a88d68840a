import { createHash } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, BASE, json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { curlExample, METADATA_EXAMPLE } from '@/components/account/curl-example';
import { curveCsv, metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

afterAll(() => closeSequelize());

async function tokenTable() {
  const [row] = await query<{ n: string; state: string; audit: string }>(`SELECT count(*)::text AS n,
    md5(coalesce(string_agg(id || ':' || coalesce(revoked_at::text, '-'), ',' ORDER BY id), '')) AS state,
    (SELECT count(*) FROM audit_events)::text AS audit FROM api_tokens`);
  return row;
}

async function refused(send: () => Promise<Response>, status: number, message?: RegExp) {
  const before = await tokenTable();
  const res = await send();
  const body = await json(res);
  expect(res.status).toBe(status);
  expect(typeof body.error).toBe('string');
  if (message) expect(body.error).toMatch(message);
  expect(await tokenTable()).toEqual(before);
}

const postJson = (c: Client, path: string, body: unknown) =>
  c.fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

function bearer(secret: string): Client {
  const base = anonymous();
  return { cookie: '', fetch: (p, init = {}) => base.fetch(p, { ...init, headers: { ...Object.fromEntries(new Headers(init.headers)), authorization: `Bearer ${secret}` } }) };
}

let owner: Client;
let ownerId: string;
let other: Client;

beforeAll(async () => {
  const a = await makeUser('contributor');
  const b = await makeUser('contributor');
  ownerId = a.id;
  owner = await signIn(a.email, a.password);
  other = await signIn(b.email, b.password);
});

describe('API tokens', () => {
  it('are shown once, stored only as a SHA-256 hash, listed with their last use, and recorded in the audit log', async () => {
    const res = await postJson(owner, '/api/tokens', { name: 'bench PC' });
    expect(res.status).toBe(201);
    const created = await json<{ id: number; token: string; name: string }>(res);
    expect(created.token.length).toBeGreaterThanOrEqual(32);
    const [row] = await query<{ token_hash: string; token_prefix: string; user_id: string }>(`SELECT token_hash, token_prefix, user_id FROM api_tokens WHERE id = :id`, { id: created.id });
    expect(row.token_hash).toBe(createHash('sha256').update(created.token).digest('hex'));
    expect(row.user_id).toBe(ownerId);
    expect(created.token.startsWith(row.token_prefix)).toBe(true);
    const [leak] = await query<{ n: number }>(`SELECT count(*)::int AS n FROM api_tokens WHERE token_hash = :t OR token_prefix = :t OR name = :t`, { t: created.token });
    expect(leak.n).toBe(0);

    let list = await json<{ items: { id: number; lastUsedAt: string | null; revokedAt: string | null; prefix: string }[] }>(await owner.fetch('/api/tokens'));
    const listed = list.items.find((t) => t.id === created.id)!;
    expect(listed).toMatchObject({ lastUsedAt: null, revokedAt: null, prefix: row.token_prefix });
    expect(JSON.stringify(list)).not.toContain(created.token);

    expect((await bearer(created.token).fetch('/api/submissions')).status).toBe(200);
    list = await json(await owner.fetch('/api/tokens'));
    expect(list.items.find((t) => t.id === created.id)!.lastUsedAt).not.toBeNull();
    const [audit] = await query<{ n: number }>(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'token.created' AND target_id = :id`, { id: String(created.id) });
    expect(audit.n).toBe(1);
  });

  it('a token lists and revokes only its owner\'s tokens; another contributor\'s revoke is a 404 and changes nothing', async () => {
    const mine = await json<{ id: number; token: string }>(await postJson(owner, '/api/tokens', { name: 'to be revoked' }));
    const theirs = await json<{ items: { id: number }[] }>(await other.fetch('/api/tokens'));
    expect(theirs.items.map((t) => t.id)).not.toContain(mine.id);
    await refused(() => other.fetch(`/api/tokens/${mine.id}`, { method: 'DELETE' }), 404);
    await refused(() => anonymous().fetch(`/api/tokens/${mine.id}`, { method: 'DELETE' }), 401);
    await refused(() => owner.fetch('/api/tokens/abc', { method: 'DELETE' }), 404);
    const res = await owner.fetch(`/api/tokens/${mine.id}`, { method: 'DELETE' });
    expect(res.status).toBe(200);
    const [row] = await query<{ revoked_at: Date | null }>(`SELECT revoked_at FROM api_tokens WHERE id = :id`, { id: mine.id });
    expect(row.revoked_at).not.toBeNull();
    // A revoked token is refused everywhere, before any work is done.
    const before = await query<{ n: number }>(`SELECT count(*)::int AS n FROM submissions`);
    const upload = await bearer(mine.token).fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve()], metadataFor()) });
    expect(upload.status).toBe(401);
    expect(await query<{ n: number }>(`SELECT count(*)::int AS n FROM submissions`)).toEqual(before);
    expect((await bearer(mine.token).fetch('/api/tokens')).status).toBe(401);
    const [audit] = await query<{ n: number }>(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'token.revoked' AND target_id = :id`, { id: String(mine.id) });
    expect(audit.n).toBe(1);
  });

  it('a token may list and revoke its owner\'s tokens (a bench script can retire itself)', async () => {
    const a = await json<{ id: number; token: string }>(await postJson(owner, '/api/tokens', { name: 'self-retiring script' }));
    const list = await json<{ items: { id: number }[] }>(await bearer(a.token).fetch('/api/tokens'));
    expect(list.items.map((t) => t.id)).toContain(a.id);
    expect((await bearer(a.token).fetch(`/api/tokens/${a.id}`, { method: 'DELETE' })).status).toBe(200);
    expect((await bearer(a.token).fetch('/api/tokens')).status).toBe(401);
  });

  it('refuses anonymous callers, tokens minting tokens, and bad names', async () => {
    await refused(() => postJson(anonymous(), '/api/tokens', { name: 'x' }), 401);
    await refused(() => anonymous().fetch('/api/tokens'), 401);
    const t = await json<{ token: string }>(await postJson(owner, '/api/tokens', { name: 'script' }));
    await refused(() => postJson(bearer(t.token), '/api/tokens', { name: 'child' }), 403, /token/);
    await refused(() => postJson(owner, '/api/tokens', { name: '  ' }), 422);
    await refused(() => owner.fetch('/api/tokens', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"name":' }), 400);
    await refused(() => postJson(bearer('bct_forged_value'), '/api/submissions', {}), 401);
  });

  it('every role from contributor up can hold tokens', async () => {
    for (const email of ['moderator@bandcone.test', 'admin@bandcone.test']) {
      const c = await signIn(email);
      const res = await postJson(c, '/api/tokens', { name: `for ${email}` });
      expect(res.status).toBe(201);
      const { token } = await json<{ token: string }>(res);
      const me = await json<{ items: unknown[] }>(await bearer(token).fetch('/api/submissions?status=submitted'));
      expect(Array.isArray(me.items)).toBe(true);
    }
  });

  it('the curl command shown on the tokens page uploads a two-angle set as written', async () => {
    const { token } = await json<{ token: string }>(await postJson(owner, '/api/tokens', { name: 'curl check' }));
    const dir = mkdtempSync(path.join(tmpdir(), 'bandcone-curl-'));
    const example = JSON.parse(METADATA_EXAMPLE) as { files: { name: string; aoiDeg: number }[] };
    writeFileSync(path.join(dir, 'metadata.json'), JSON.stringify({ ...example, label: `curl upload ${Date.now()}` }));
    for (const f of example.files) writeFileSync(path.join(dir, f.name), curveCsv({ aoiDeg: f.aoiDeg, nEff: 2, noiseSeed: (Date.now() % 100000) + f.aoiDeg }));
    const out = execFileSync('bash', ['-c', curlExample(BASE, token)], { cwd: dir, encoding: 'utf8' });
    const body = JSON.parse(out) as { id: number; status: string; curveIds: number[] };
    expect(body.status).toBe('submitted');
    expect(body.curveIds).toHaveLength(2);
    const files = await query<{ original_name: string; aoi_deg: number }>(`SELECT original_name, aoi_deg FROM submission_files WHERE submission_id = :id ORDER BY aoi_deg`, { id: body.id });
    expect(files).toEqual(example.files.map((f) => ({ original_name: f.name, aoi_deg: f.aoiDeg })));
  });
});
