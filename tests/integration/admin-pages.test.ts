import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { json, signIn, type Client } from '../support/http';
import { makeUser } from '../support/users';
import { db } from '@/db/models';
import { closeSequelize } from '@/db/connection';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

afterAll(() => closeSequelize());

// The admin pages render on the server from lib/admin/*; these read their HTML as an admin would.
let admin: Client;
beforeAll(async () => {
  admin = await signIn('admin@bandcone.test');
});

async function page(path: string): Promise<string> {
  const res = await admin.fetch(path);
  expect(res.status, path).toBe(200);
  return res.text();
}
const rows = (html: string, testid: string) => html.split(`data-testid="${testid}"`).length - 1;
const patch = (id: string, body: unknown) =>
  admin.fetch(`/api/admin/users/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
const amp = (s: string) => s.replaceAll('&', '&amp;');

describe('the audit log page', () => {
  it('filters by target, action, actor and date, and links and summarises each row', async () => {
    const target = await makeUser();
    expect((await patch(target.id, { role: 'moderator' })).status).toBe(200);
    const t = encodeURIComponent(target.email);

    const all = await page(`/admin/audit?target=${t}`);
    expect(rows(all, 'audit-row')).toBe(1);
    expect(all).toContain('Role changed');
    // a summary in words, not the stored JSON
    expect(all).toContain(`${target.email}: Contributor, active → Moderator, active`);
    expect(all).not.toContain('&quot;before&quot;');
    // the target links to the user, the actor to theirs
    expect(all).toContain(amp(`href="/admin/users?q=${t}"`));
    expect(all).toContain(amp(`href="/admin/users?q=${encodeURIComponent('admin@bandcone.test')}"`));

    expect(rows(await page(`/admin/audit?target=${t}&action=user.role_changed`), 'audit-row')).toBe(1);
    expect(rows(await page(`/admin/audit?target=${t}&action=user.`), 'audit-row')).toBe(1);
    const none = await page(`/admin/audit?target=${t}&action=token.created`);
    expect(rows(none, 'audit-row')).toBe(0);
    expect(none).toContain('No event matches these filters.');

    expect(rows(await page(`/admin/audit?target=${t}&actor=admin%40bandcone`), 'audit-row')).toBe(1);
    expect(rows(await page(`/admin/audit?target=${t}&actor=system`), 'audit-row')).toBe(0);

    const today = new Date().toISOString().slice(0, 10);
    expect(rows(await page(`/admin/audit?target=${t}&from=${today}&to=${today}`), 'audit-row')).toBe(1);
    expect(rows(await page(`/admin/audit?target=${t}&from=2000-01-01&to=2000-01-02`), 'audit-row')).toBe(0);
    // a date that does not read is dropped, not an error page
    expect(rows(await page(`/admin/audit?target=${t}&from=yesterday`), 'audit-row')).toBe(1);
  });

  it('finds a submission by S- id and the curve it made by C- id, with links to both', async () => {
    const u = await makeUser();
    const c = await signIn(u.email, u.password);
    const res = await c.fetch('/api/submissions', { method: 'POST', body: submissionForm([singleCurve()], metadataFor({ label: 'Audit link check' })) });
    expect(res.status).toBe(201);
    const s = await json<{ id: number; curveIds: number[] }>(res);
    const bySubmission = await page(`/admin/audit?target=S-${s.id}`);
    expect(rows(bySubmission, 'audit-row')).toBe(1);
    expect(bySubmission).toContain('Submission sent');
    expect(bySubmission).toContain(`href="/review/${s.id}"`);
    expect(bySubmission).toContain(`Submission S-${s.id}`);
    expect(bySubmission).toContain(`curves C-${s.curveIds[0]}`);
    expect(bySubmission).toContain('“Audit link check”');
    const byCurve = await page(`/admin/audit?target=C-${s.curveIds[0]}`);
    expect(rows(byCurve, 'audit-row')).toBe(1);
    // "S-" never reads as a curve and "C-" never as a submission
    expect(rows(await page(`/admin/audit?target=C-${s.id}&action=submission.created&actor=${encodeURIComponent(u.email)}`), 'audit-row')).toBe(s.id === s.curveIds[0] ? 1 : 0);
    const bad = await page('/admin/audit?target=whatever');
    expect(bad).toContain('is not a target');
  });

  it('pages through 50 events at a time, keeping the filters', async () => {
    const u = await makeUser();
    for (let i = 0; i < 3; i++) {
      expect((await patch(u.id, { role: i % 2 ? 'contributor' : 'moderator' })).status).toBe(200);
    }
    const first = await page(`/admin/audit?target=${encodeURIComponent(u.email)}`);
    expect(first).toMatch(/Page <span class="figures">1<\/span> of <span class="figures">1<\/span> · <span class="figures">3<\/span> events/);
    const total = await db().AuditEvent.count();
    const p1 = await page('/admin/audit');
    expect(rows(p1, 'audit-row')).toBe(Math.min(50, total));
    if (total > 50) {
      expect(p1).toContain(amp('href="/admin/audit?page=2"'));
      expect(rows(await page('/admin/audit?page=2'), 'audit-row')).toBe(Math.min(50, total - 50));
    }
  });
});

describe('the users page', () => {
  it('finds users by part of the name or e-mail, pages by 25, and matches % literally', async () => {
    const token = `zq${randomUUID().slice(0, 6)}`;
    const made = [];
    for (let i = 0; i < 26; i++) {
      const u = await makeUser();
      await db().User.update({ name: `Finder ${token} ${i}` }, { where: { id: u.id } });
      made.push(u);
    }
    const p1 = await page(`/admin/users?q=${token}`);
    expect(rows(p1, 'user-row')).toBe(25);
    expect(p1).toMatch(/Page <span class="figures">1<\/span> of <span class="figures">2<\/span> · <span class="figures">26<\/span> users/);
    expect(p1).toContain(amp(`href="/admin/users?q=${token}&page=2"`));
    expect(rows(await page(`/admin/users?q=${token}&page=2`), 'user-row')).toBe(1);
    // by e-mail, case aside
    const one = await page(`/admin/users?q=${encodeURIComponent(made[3].email.toUpperCase())}`);
    expect(rows(one, 'user-row')).toBe(1);
    expect(one).toContain(made[3].email);
    // % and _ are letters here, not wildcards
    expect(rows(await page(`/admin/users?q=${token.slice(0, 2)}%25${token.slice(3)}`), 'user-row')).toBe(0);
    expect(rows(await page(`/admin/users?q=${token.slice(0, 2)}_${token.slice(3)}`), 'user-row')).toBe(0);

    // the state is a badge, apart from the action
    expect((await patch(made[0].id, { disabled: true })).status).toBe(200);
    const disabled = await page(`/admin/users?q=${token}&access=disabled`);
    expect(rows(disabled, 'user-row')).toBe(1);
    expect(disabled).toContain('data-access="disabled"');
    expect(disabled).toContain(`aria-label="Enable ${made[0].email}…"`);
    expect(rows(await page(`/admin/users?q=${token}&access=active`), 'user-row')).toBe(25);
    expect(rows(await page(`/admin/users?q=${token}&role=admin`), 'user-row')).toBe(0);
  });

  it('is for admins only', async () => {
    const moderator = await signIn('moderator@bandcone.test');
    for (const path of ['/admin/users?q=a', '/admin/audit?actor=system']) {
      const res = await moderator.fetch(path);
      expect(res.status, path).not.toBe(200);
      expect(await res.text()).not.toContain('data-testid="user-row"');
    }
  });
});
