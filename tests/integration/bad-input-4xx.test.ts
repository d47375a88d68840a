import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, BASE, json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { curveCsv, metadataFor, submissionForm } from './submissions-fixtures';

// Bad input answers a 4xx with a reason, never a 500 (docs/product.md, "Errors").
afterAll(() => closeSequelize());

type ErrorBody = { error: string; details: unknown[] };

async function expectReason(res: Response, status: number) {
  const body = await json<ErrorBody>(res);
  expect([res.status, typeof body.error]).toEqual([status, 'string']);
  expect(body.error.length).toBeGreaterThan(10);
  return body;
}

let contributor: Client;
let admin: Client;

beforeAll(async () => {
  const u = await makeUser();
  contributor = await signIn(u.email, u.password);
  admin = await signIn('admin@bandcone.test');
});

describe('a two-file set whose CWLs imply an effective index outside 1–4', () => {
  it('is stored with no n_eff and a warning for the moderator, not a 500', async () => {
    // s(θ) = sqrt(1 − sin²θ / n_eff²) with n_eff 14: the 30° curve sits only 0.42 nm blueward.
    const files = [
      { name: 'set-aoi0.csv', text: curveCsv({ aoiDeg: 0, nEff: 14, noiseSeed: 4242 }) },
      { name: 'set-aoi30.csv', text: curveCsv({ aoiDeg: 30, nEff: 14, noiseSeed: 4343 }) },
    ];
    const res = await contributor.fetch('/api/submissions', {
      method: 'POST',
      body: submissionForm(files, metadataFor({ files: [{ name: 'set-aoi0.csv', aoiDeg: 0 }, { name: 'set-aoi30.csv', aoiDeg: 30 }] })),
    });
    expect(res.status).toBe(201);
    const body = await json<{ id: number; nEff: number | null; checks: { code: string; level: string; message: string }[] }>(res);
    expect(body.nEff).toBeNull();
    const check = body.checks.find((c) => c.code === 'set-neff');
    expect(check?.level).toBe('warn');
    expect(check?.message).toMatch(/outside 1\.0–4\.0/);
    const rows = await query<{ n_eff: number | null }>('SELECT n_eff FROM curves WHERE submission_id = :id', { id: body.id });
    expect(rows.map((r) => r.n_eff)).toEqual([null, null]);
  });
});

describe('ids in paths', () => {
  it('an id of dashes on the admin route is a 404, not a database error', async () => {
    const res = await admin.fetch(`/api/admin/users/${'-'.repeat(36)}`, {
      method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ role: 'moderator' }),
    });
    await expectReason(res, 404);
    for (const id of ['---', 'zzzzzzzz-zzzz-zzzz-zzzz-zzzzzzzzzzzz', '00000000-0000-0000-0000-00000000000g']) {
      const r = await admin.fetch(`/api/admin/users/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: '{"role":"moderator"}' });
      await expectReason(r, 404);
    }
  });

  it('broken percent-encoding in a curve id is a 4xx', async () => {
    const res = await fetch(`${BASE}/api/curves/%E0%A4%A`);
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
  });

  it.each(['0x10', '1e1', '+7', ' 7', '7.0', '010000000000', '99999999999999999999', '-1', '0'])('numeric id %j answers 404', async (id) => {
    const res = await contributor.fetch(`/api/optics/${encodeURIComponent(id)}`);
    await expectReason(res, 404);
    const curve = await anonymous().fetch(`/api/curves/${encodeURIComponent(id)}`);
    await expectReason(curve, 404);
  });
});

describe('sign-in with a malformed callbackUrl', () => {
  it.each(['http://[', 'http://%zz', '::::', 'https://evil.invalid/x'])('%j does not break sign-in or leave the site', async (callbackUrl) => {
    const client = anonymous();
    const { csrfToken } = await json<{ csrfToken: string }>(await client.fetch('/api/auth/csrf'));
    const res = await client.fetch('/api/auth/signin/email', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken, email: `cb-${Date.now()}@bandcone.test`, callbackUrl, json: 'true' }),
    });
    expect(res.status).toBeLessThan(500);
    const where = res.headers.get('location') ?? ((await res.json().catch(() => ({}))) as { url?: string }).url ?? '';
    if (where) expect(new URL(where, BASE).origin).toBe(new URL(BASE).origin);
    // the credentials flow too
    const { csrfToken: t2 } = await json<{ csrfToken: string }>(await client.fetch('/api/auth/csrf'));
    const cred = await client.fetch('/api/auth/callback/credentials', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken: t2, email: `nobody-${Date.now()}@bandcone.test`, password: 'wrong password', callbackUrl, json: 'true' }),
    });
    expect(cred.status).toBeLessThan(500);
  });
});
