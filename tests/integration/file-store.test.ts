import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Sequelize } from 'sequelize';
import pg from 'pg';
import { json, signIn, type Client } from '../support/http';
import { makeUser } from '../support/users';
import { count, query } from '../support/db';
import { closeSequelize, getOwnerSequelize } from '@/db/connection';
import { exists, rawKey, readCapped, stagingKey } from '@/lib/storage/objects';
import { presignUpload } from '@/lib/storage/uploads';
import { sweepStaging } from '@/lib/storage/sweep';
import { moveRawFilesToStore } from '@/lib/storage/move';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

// Raw files in the file store (the fake S3 that scripts/test.sh starts, or S3_ENDPOINT): the
// browser's way (presign → PUT to a staging key → submit naming it), the API's multipart way,
// every refusal leaving no submission, and the move of files kept in the database before 0012.
// The SHA-256 of each file is computed by Node's crypto (OpenSSL's FIPS 180-4 implementation),
// not by the code under test.

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
let contributor: Client;
let userId: string;

beforeAll(async () => {
  const user = await makeUser('contributor');
  userId = user.id;
  contributor = await signIn(user.email, user.password);
});
afterAll(() => closeSequelize());

const jsonPost = (c: Client, path: string, body: unknown) =>
  c.fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

async function presign(bytes: Buffer, announce: { size?: number; sha256?: string; name?: string } = {}) {
  const res = await jsonPost(contributor, '/api/uploads/presign', {
    name: announce.name ?? 'ha.csv', size: announce.size ?? bytes.length, sha256: announce.sha256 ?? sha256(bytes), type: 'text/csv',
  });
  expect(res.status).toBe(201);
  return json<{ uploadId: string; url: string; method: 'PUT'; headers: Record<string, string>; expiresAt: string }>(res);
}

const put = (url: string, bytes: Buffer, headers: Record<string, string> = {}) => fetch(url, { method: 'PUT', body: new Uint8Array(bytes), headers });
const submissionsOf = () => count('submissions', `contributor_id = '${userId}'`);

describe('browser uploads through presigned URLs', () => {
  it('presign → PUT → submit stores the file once at raw/<sha256> and forgets the staging copy', async () => {
    const bytes = Buffer.from(singleCurve('staged.csv').text as string);
    const p = await presign(bytes, { name: 'staged.csv' });
    expect(p.method).toBe('PUT');
    expect(new Date(p.expiresAt).getTime()).toBeGreaterThan(Date.now());
    expect((await put(p.url, bytes, p.headers)).status).toBe(200);
    const res = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor({ label: 'Staged Hα 3 nm' }), uploads: [p.uploadId] });
    expect(res.status).toBe(201);
    const created = await json<{ id: number; curveIds: number[] }>(res);
    const [row] = await query<{ id: number; sha256: string; size_bytes: number; has_content: boolean; media_type: string; original_name: string }>(
      'SELECT id, sha256, size_bytes, content IS NOT NULL AS has_content, media_type, original_name FROM submission_files WHERE submission_id = :id', { id: created.id });
    expect(row).toMatchObject({ sha256: sha256(bytes), size_bytes: bytes.length, has_content: false, media_type: 'text/csv', original_name: 'staged.csv' });
    const stored = await readCapped(rawKey(sha256(bytes)), 10 * 1024 * 1024);
    expect(stored && 'sha256' in stored && stored.sha256).toBe(sha256(bytes));
    expect(await exists(stagingKey(p.uploadId))).toBe(false);
    expect(await count('upload_stages', `id = '${p.uploadId}'`)).toBe(0);
    // Byte for byte back through the API, from the bucket.
    const download = await contributor.fetch(`/api/submissions/${created.id}/files/${row.id}`);
    expect(download.status).toBe(200);
    expect(download.headers.get('x-content-sha256')).toBe(sha256(bytes));
    expect(Buffer.from(await download.arrayBuffer()).equals(bytes)).toBe(true);
    // The same uploadId cannot be submitted twice.
    const again = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] });
    expect(again.status).toBe(422);
  });

  it('two submissions naming the same upload at once make one submission', async () => {
    const bytes = Buffer.from(singleCurve('twice.csv').text as string);
    const p = await presign(bytes, { name: 'twice.csv' });
    expect((await put(p.url, bytes)).status).toBe(200);
    const before = await submissionsOf();
    const statuses = (await Promise.all([0, 1].map(() => jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] })))).map((r) => r.status).sort();
    expect(statuses[0]).toBe(201);
    expect([409, 422]).toContain(statuses[1]);
    expect(await submissionsOf()).toBe(before + 1);
  });

  it('a file that arrives different from its announced SHA-256 leaves no submission', async () => {
    const bytes = Buffer.from(singleCurve('swapped.csv').text as string);
    // Same length, one digit changed near the end.
    const other = Buffer.from(bytes);
    other[other.length - 2] = other[other.length - 2] === 0x31 ? 0x32 : 0x31;
    expect(other.equals(bytes)).toBe(false);
    const p = await presign(bytes, { name: 'swapped.csv' });
    expect((await put(p.url, other)).status).toBe(200);
    const before = await submissionsOf();
    const res = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] });
    expect(res.status).toBe(422);
    expect((await json<{ error: string }>(res)).error).toMatch(/^swapped\.csv: arrived different from the file announced \(its SHA-256 does not match\)/);
    expect(await submissionsOf()).toBe(before);
    expect(await exists(stagingKey(p.uploadId))).toBe(false);
    expect(await exists(rawKey(sha256(other)))).toBe(false);
  });

  it('a file that arrives with another size leaves no submission', async () => {
    const bytes = Buffer.from(singleCurve('short.csv').text as string);
    const p = await presign(bytes, { name: 'short.csv' });
    // A real S3 refuses a body whose length differs from the signed content-length; the fake
    // stores it, so the submission's own check is what is tested here.
    const longer = Buffer.concat([bytes, Buffer.from('656.9,0.001\n')]);
    const putRes = await put(p.url, longer);
    const before = await submissionsOf();
    const res = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] });
    expect(res.status).toBe(422);
    const { error } = await json<{ error: string }>(res);
    if (putRes.status === 200) expect(error).toBe(`short.csv: arrived as ${longer.length} bytes, not the ${bytes.length} announced; nothing was submitted. Send the file again.`);
    else expect(error).toMatch(/never arrived/);
    expect(await submissionsOf()).toBe(before);
  });

  it('a file that never arrived leaves no submission and says so', async () => {
    const bytes = Buffer.from(singleCurve('lost.csv').text as string);
    const p = await presign(bytes, { name: 'lost.csv' });
    const before = await submissionsOf();
    const res = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] });
    expect(res.status).toBe(422);
    expect((await json<{ error: string }>(res)).error).toMatch(/^lost\.csv: never arrived in the file store/);
    expect(await submissionsOf()).toBe(before);
  });

  it('an expired URL is refused by the store, and the submission then says the file never arrived', async () => {
    const bytes = Buffer.from(singleCurve('late.csv').text as string);
    const p = await presignUpload(userId, { name: 'late.csv', size: bytes.length, sha256: sha256(bytes) }, 1);
    await new Promise((r) => setTimeout(r, 2100));
    const late = await put(p.url, bytes);
    expect(late.status).toBe(403);
    expect(await late.text()).toContain('Request has expired');
    const res = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] });
    expect(res.status).toBe(422);
    expect((await json<{ error: string }>(res)).error).toMatch(/never arrived .*signed address had expired/);
  });

  it('an upload of another contributor cannot be submitted', async () => {
    const bytes = Buffer.from(singleCurve('theirs.csv').text as string);
    const other = await makeUser('contributor');
    const p = await presignUpload(other.id, { name: 'theirs.csv', size: bytes.length, sha256: sha256(bytes) });
    expect((await put(p.url, bytes)).status).toBe(200);
    const res = await jsonPost(contributor, '/api/submissions', { metadata: metadataFor(), uploads: [p.uploadId] });
    expect(res.status).toBe(422);
    expect((await json<{ error: string }>(res)).error).toMatch(/is not one of yours/);
  });

  it('presign refuses what could never be submitted, and visitors', async () => {
    const refused = async (body: unknown) => (await jsonPost(contributor, '/api/uploads/presign', body)).status;
    expect(await refused({ name: 'big.csv', size: 5 * 1024 * 1024 + 1, sha256: 'a'.repeat(64) })).toBe(422);
    expect(await refused({ name: 'empty.csv', size: 0, sha256: 'a'.repeat(64) })).toBe(422);
    expect(await refused({ name: 'x.csv', size: 10, sha256: 'A'.repeat(64) })).toBe(422);
    expect(await refused({ name: 'x.csv', size: 10, sha256: 'a'.repeat(6400) })).toBe(422);
    expect(await refused({ name: '', size: 10, sha256: 'a'.repeat(64) })).toBe(422);
    const visitor = await fetch(`${process.env.TEST_BASE_URL}/api/uploads/presign`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'x.csv', size: 10, sha256: 'a'.repeat(64) }) });
    expect(visitor.status).toBe(401);
  });

  it('presign is rate limited per contributor', async () => {
    const user = await makeUser('contributor');
    const c = await signIn(user.email, user.password);
    const statuses: number[] = [];
    for (let i = 0; i < 62; i++) statuses.push((await jsonPost(c, '/api/uploads/presign', { name: `f${i}.csv`, size: 10, sha256: 'b'.repeat(64) })).status);
    expect(statuses.slice(0, 60).every((s) => s === 201)).toBe(true);
    expect(statuses.slice(60)).toEqual([429, 429]);
  }, 60_000);

  it('stale staging objects and their rows are swept', async () => {
    const bytes = Buffer.from('stale\n');
    const p = await presignUpload(userId, { name: 'stale.csv', size: bytes.length, sha256: sha256(bytes) });
    expect((await put(p.url, bytes)).status).toBe(200);
    await getOwnerSequelize().query(`UPDATE upload_stages SET created_at = now() - interval '2 days' WHERE id = :id`, { replacements: { id: p.uploadId } });
    // Seen from two days on, this object is two days old.
    const swept = await sweepStaging(24 * 3600, Date.now() + 2 * 24 * 3600 * 1000);
    expect(swept.rows).toBeGreaterThanOrEqual(1);
    expect(swept.objects).toBeGreaterThanOrEqual(1);
    expect(await exists(stagingKey(p.uploadId))).toBe(false);
    expect(await count('upload_stages', `id = '${p.uploadId}'`)).toBe(0);
  });
});

describe('API clients posting multipart', () => {
  it('the server puts the file in the bucket itself; the row keeps hash, size, name and type', async () => {
    const file = singleCurve('api.csv');
    const bytes = Buffer.from(file.text as string);
    const res = await contributor.fetch('/api/submissions', { method: 'POST', body: submissionForm([file], metadataFor({ label: 'API Hα 3 nm' })) });
    expect(res.status).toBe(201);
    const { id } = await json<{ id: number }>(res);
    const [row] = await query<{ id: number; sha256: string; has_content: boolean; media_type: string }>(
      'SELECT id, sha256, content IS NOT NULL AS has_content, media_type FROM submission_files WHERE submission_id = :id', { id });
    expect(row).toMatchObject({ sha256: sha256(bytes), has_content: false, media_type: 'text/csv' });
    expect(await exists(rawKey(sha256(bytes)))).toBe(true);
    const download = await contributor.fetch(`/api/submissions/${id}/files/${row.id}`);
    expect(Buffer.from(await download.arrayBuffer()).equals(bytes)).toBe(true);
  });
});

describe('files kept in the database before migration 0012', () => {
  it('move to the bucket, byte for byte, and the row keeps its hash; the app role can neither empty nor change a row', async () => {
    const owner = getOwnerSequelize();
    const bytes = Buffer.from(singleCurve('old.csv').text as string);
    const [[sub]] = (await owner.query(
      `INSERT INTO submissions (contributor_id, label, lines, metadata, checks, check_level) VALUES (:userId, 'Old Hα', ARRAY['Ha'], '{}', '[]', 'info') RETURNING id`,
      { replacements: { userId } },
    )) as [{ id: number }[], unknown];
    const [[file]] = (await owner.query(
      `INSERT INTO submission_files (submission_id, original_name, size_bytes, sha256, content) VALUES (:sub, 'old.csv', :size, :sha, :content) RETURNING id`,
      { replacements: { sub: sub.id, size: bytes.length, sha: sha256(bytes), content: bytes } },
    )) as [{ id: number }[], unknown];

    // The app role may not empty the column (only the owner's move may), nor change the hash.
    const app = new Sequelize(process.env.TEST_APP_DATABASE_URL as string, { dialect: 'postgres', dialectModule: pg, logging: false });
    try {
      await expect(app.query('UPDATE submission_files SET content = NULL WHERE id = :id', { replacements: { id: file.id } })).rejects.toThrow(/only ever move to the file store, by the owner/);
      await expect(app.query(`UPDATE submission_files SET sha256 = :sha WHERE id = :id`, { replacements: { id: file.id, sha: 'c'.repeat(64) } })).rejects.toThrow(/never change/);
    } finally {
      await app.close();
    }
    await expect(owner.query(`UPDATE submission_files SET content = :other WHERE id = :id`, { replacements: { id: file.id, other: Buffer.from('x') } })).rejects.toThrow(/only ever move/);

    const report = await moveRawFilesToStore(owner);
    expect(report.moved + report.alreadyThere).toBeGreaterThanOrEqual(1);
    expect(report.refused).toEqual([]);
    const [row] = await query<{ has_content: boolean; sha256: string }>('SELECT content IS NOT NULL AS has_content, sha256 FROM submission_files WHERE id = :id', { id: file.id });
    expect(row).toEqual({ has_content: false, sha256: sha256(bytes) });
    const stored = await readCapped(rawKey(sha256(bytes)), 10 * 1024 * 1024);
    expect(stored && 'bytes' in stored && stored.bytes.equals(bytes)).toBe(true);
    // A second run finds nothing left to move.
    const again = await moveRawFilesToStore(owner);
    expect(again.moved + again.alreadyThere).toBe(0);
    const download = await contributor.fetch(`/api/submissions/${sub.id}/files/${file.id}`);
    expect(download.status).toBe(200);
    expect(Buffer.from(await download.arrayBuffer()).equals(bytes)).toBe(true);
  });
});
