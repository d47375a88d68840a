import { afterAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn, trySignIn } from '../support/http';
import { count, query, waitForMail } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';

afterAll(() => closeSequelize());

describe('public catalogue of lines', () => {
  it('serves docs/model.md §Lines with vacuum values', async () => {
    const res = await anonymous().fetch('/api/lines');
    expect(res.status).toBe(200);
    const lines = await json<{ id: string; airNm: number; vacuumNm: number }[]>(res);
    const ha = lines.find((l) => l.id === 'Ha')!;
    expect(ha.airNm).toBe(656.28);
    // IAU/Morton 2000 worked value: Hα 656.461 nm in vacuum is 656.280 nm in air.
    expect(ha.vacuumNm).toBeCloseTo(656.461, 2);
    expect(lines.map((l) => l.id)).toEqual(expect.arrayContaining(['Ha', 'Hb', 'Hg', 'OIII', 'OIII-496', 'NII-658', 'NII-655', 'SII-671', 'SII-673', 'HeII', 'OI', 'ArIII', 'OII']));
  });
});

describe('authorisation is decided on the server', () => {
  it('refuses a signed-out submission with 401 and writes nothing', async () => {
    const before = await count('submissions');
    const form = new FormData();
    form.append('metadata', '{}');
    form.append('file', new Blob(['650,0.1\n']), 'a.csv');
    const res = await anonymous().fetch('/api/submissions', { method: 'POST', body: form });
    expect(res.status).toBe(401);
    expect((await json(res)).error).toMatch(/sign in/i);
    expect(await count('submissions')).toBe(before);
  });

  it('answers 403 when a contributor calls a moderator route', async () => {
    const contributor = await signIn('contributor@bandcone.test');
    const [waiting] = await query<{ id: number }>(`SELECT id FROM submissions WHERE status = 'submitted' ORDER BY id LIMIT 1`);
    const res = await contributor.fetch(`/api/submissions/${waiting.id}/review`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'verify', note: '' }),
    });
    expect(res.status).toBe(403);
    const [{ status }] = await query<{ status: string }>('SELECT status FROM submissions WHERE id = :id', { id: waiting.id });
    expect(status).toBe('submitted');
  });

  it('lets only an admin change a role, and records it', async () => {
    const target = await makeUser();
    const body = JSON.stringify({ role: 'moderator' });
    const headers = { 'content-type': 'application/json' };
    expect((await anonymous().fetch(`/api/admin/users/${target.id}`, { method: 'PATCH', headers, body })).status).toBe(401);
    const moderator = await signIn('moderator@bandcone.test');
    expect((await moderator.fetch(`/api/admin/users/${target.id}`, { method: 'PATCH', headers, body })).status).toBe(403);
    const admin = await signIn('admin@bandcone.test');
    const res = await admin.fetch(`/api/admin/users/${target.id}`, { method: 'PATCH', headers, body });
    expect(res.status).toBe(200);
    expect((await json(res)).role).toBe('moderator');
    expect(await count('audit_events', `action = 'user.role_changed' AND target_id = '${target.id}'`)).toBe(1);
  });

  it('a disabled account cannot sign in, and its session stops working', async () => {
    const user = await makeUser();
    const session = await signIn(user.email, user.password);
    const admin = await signIn('admin@bandcone.test');
    const res = await admin.fetch(`/api/admin/users/${user.id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ disabled: true }) });
    expect(res.status).toBe(200);
    expect(await trySignIn(user.email, user.password)).toBeNull();
    const after = await json(await session.fetch('/api/auth/session'));
    expect(after?.user).toBeUndefined();
  });
});

describe('accounts by e-mail', () => {
  it('registers, refuses sign-in until the address is confirmed, then signs in', async () => {
    const email = `new-${Date.now()}@bandcone.test`;
    const res = await anonymous().fetch('/api/account/register', {
      method: 'POST', headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ name: 'Nova Tester', email, password: 'a long enough secret' }),
    });
    expect(res.status).toBe(202);
    expect(await trySignIn(email, 'a long enough secret')).toBeNull();
    const mail = await waitForMail(email, '%Confirm%');
    const link = mail.text_body.match(/\/confirm-email\?token=([\w-]+)/)![0];
    const page = await anonymous().fetch(link);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('is confirmed');
    expect(await trySignIn(email, 'a long enough secret')).not.toBeNull();
  });

  it('makes no second account for the same address (same answer as a new one: 202), and refuses bad input with 422', async () => {
    const headers = { 'content-type': 'application/json' };
    const dup = await anonymous().fetch('/api/account/register', { method: 'POST', headers, body: JSON.stringify({ name: 'Again', email: 'contributor@bandcone.test', password: 'a long enough secret' }) });
    expect(dup.status).toBe(202);
    expect(await count('users', `email = 'contributor@bandcone.test'`)).toBe(1);
    const bad = await anonymous().fetch('/api/account/register', { method: 'POST', headers, body: JSON.stringify({ name: 'X', email: 'not-an-address', password: 'short' }) });
    expect(bad.status).toBe(422);
    const body = await json(bad);
    expect(body.details.map((d: { field: string }) => d.field)).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('resets a password through the mailed link', async () => {
    const user = await makeUser();
    const res = await anonymous().fetch('/api/account/reset', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: user.email }) });
    expect(res.status).toBe(202);
    const mail = await waitForMail(user.email, '%Reset%');
    const token = mail.text_body.match(/reset-password\/([\w-]+)/)![1];
    const confirm = await anonymous().fetch('/api/account/reset/confirm', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, password: 'a brand new password' }) });
    expect(confirm.status).toBe(200);
    expect(await trySignIn(user.email, user.password)).toBeNull();
    expect(await trySignIn(user.email, 'a brand new password')).not.toBeNull();
    // The link works once.
    const again = await anonymous().fetch('/api/account/reset/confirm', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token, password: 'yet another password' }) });
    expect(again.status).toBe(422);
  });

  it('limits failed sign-ins per account: after 8 failures even the right password waits', async () => {
    const user = await makeUser();
    for (let i = 0; i < 8; i++) expect(await trySignIn(user.email, `wrong password ${i}`)).toBeNull();
    expect(await trySignIn(user.email, user.password)).toBeNull();
    const other = await makeUser();
    expect(await trySignIn(other.email, other.password)).not.toBeNull();
  });

  it('sends an e-mail sign-in link that signs the user in', async () => {
    const user = await makeUser();
    const client = anonymous();
    const { csrfToken } = await json(await client.fetch('/api/auth/csrf'));
    const res = await client.fetch('/api/auth/signin/email', {
      method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken, email: user.email, json: 'true' }),
    });
    expect([200, 302]).toContain(res.status);
    const mail = await waitForMail(user.email, '%sign-in link%');
    const url = new URL(mail.text_body.match(/https?:\/\/\S+/)![0]);
    const callback = await client.fetch(url.pathname + url.search);
    expect([200, 302]).toContain(callback.status);
    const session = await json(await client.fetch('/api/auth/session'));
    expect(session.user.email).toBe(user.email);
  });
});
