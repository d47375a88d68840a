import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { json, signIn, type Client } from '../support/http';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { metadataFor, singleCurve, submissionForm, type Upload } from './submissions-fixtures';

// Something the caller may not see is never named to them, and answers exactly like
// something missing (docs/product.md, "Roles"; OWASP ASVS V4 "access control", common practice).
afterAll(() => closeSequelize());

type Checks = { id: number; curveIds: number[]; checks: { code: string; message: string }[] };

let owner: Client;
let other: Client;
let moderator: Client;

const submit = async (c: Client, file: Upload, label = 'Private Optics Hα 3 nm') => {
  const res = await c.fetch('/api/submissions', { method: 'POST', body: submissionForm([file], metadataFor({ label })) });
  expect(res.status).toBe(201);
  return json<Checks>(res);
};

/** Same status and the same words (ids aside) as for a row that does not exist. */
async function likeMissing(res: Response, missing: Response) {
  const [a, b] = [await json<{ error: string }>(res), await json<{ error: string }>(missing)];
  expect([res.status, a.error.replace(/\d+/g, 'N')]).toEqual([404, b.error.replace(/\d+/g, 'N')]);
  expect(missing.status).toBe(404);
}

beforeAll(async () => {
  const a = await makeUser();
  const b = await makeUser();
  owner = await signIn(a.email, a.password);
  other = await signIn(b.email, b.password);
  moderator = await signIn('moderator@bandcone.test');
});

describe('the duplicate check', () => {
  it('names an unreviewed curve only to its contributor (and moderators), says only "same points exist" to others', async () => {
    const file = singleCurve('secret.csv');
    const first = await submit(owner, file, 'Secret Label Hα 3 nm');
    const byOther = await submit(other, file, 'Another label');
    const dup = byOther.checks.find((c) => c.code === 'duplicate');
    expect(dup?.message).toBe('A curve with the same points exists.');
    expect(JSON.stringify(byOther)).not.toContain('Secret Label');
    expect(dup?.message).not.toContain(String(first.curveIds[0]));
    const byOwner = await submit(owner, file, 'Again');
    expect(byOwner.checks.find((c) => c.code === 'duplicate')?.message).toContain(`curve ${first.curveIds[0]}`);
    const byModerator = await submit(moderator, file, 'Moderator copy');
    expect(byModerator.checks.find((c) => c.code === 'duplicate')?.message).toContain('Secret Label');
  });
});

describe('someone else’s things answer 404 like missing ones, on every method', () => {
  it('a submission: GET, raw file, notes, revise', async () => {
    const s = await submit(owner, singleCurve('mine.csv'));
    const detail = await json<{ files: { id: number }[] }>(await owner.fetch(`/api/submissions/${s.id}`));
    const fileId = detail.files[0].id;
    const missing = 999_999_990;
    await likeMissing(await other.fetch(`/api/submissions/${s.id}`), await other.fetch(`/api/submissions/${missing}`));
    await likeMissing(await other.fetch(`/api/submissions/${s.id}/files/${fileId}`), await other.fetch(`/api/submissions/${missing}/files/${fileId}`));
    const note = (id: number) => other.fetch(`/api/submissions/${id}/notes`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"body":"hello"}' });
    await likeMissing(await note(s.id), await note(missing));
    const revise = (id: number) => other.fetch(`/api/submissions/${id}/revise`, { method: 'POST', body: submissionForm([singleCurve('x.csv')], metadataFor()) });
    await likeMissing(await revise(s.id), await revise(missing));
  });

  it('an optic: GET, PATCH, DELETE', async () => {
    const res = await owner.fetch('/api/optics', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Private scope', fNumber: 4 }) });
    const { id } = await json<{ id: number }>(res);
    const missing = 99_999_991;
    const patch = (i: number) => other.fetch(`/api/optics/${i}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: '{"name":"x"}' });
    await likeMissing(await other.fetch(`/api/optics/${id}`), await other.fetch(`/api/optics/${missing}`));
    await likeMissing(await patch(id), await patch(missing));
    await likeMissing(await other.fetch(`/api/optics/${id}`, { method: 'DELETE' }), await other.fetch(`/api/optics/${missing}`, { method: 'DELETE' }));
    expect((await owner.fetch(`/api/optics/${id}`)).status).toBe(200);
  });

  it('a token: DELETE', async () => {
    const res = await owner.fetch('/api/tokens', { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{"name":"bench"}' });
    const { id } = await json<{ id: number }>(res);
    await likeMissing(await other.fetch(`/api/tokens/${id}`, { method: 'DELETE' }), await other.fetch('/api/tokens/99999992', { method: 'DELETE' }));
    const list = await json<{ items: { id: number; revokedAt: string | null }[] }>(await owner.fetch('/api/tokens'));
    expect(list.items.find((t) => t.id === id)?.revokedAt).toBeNull();
  });
});
