import { createHash } from 'node:crypto';
import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeUser } from '../support/users';
import { count, query } from '../support/db';
import { closeSequelize } from '@/db/connection';
import { errorResponse, HttpError } from '@/lib/http/errors';
import { metadataFor, singleCurve } from './submissions-fixtures';

// The file store is away: this file points the storage client at a loopback port nobody
// listens on (this module's own copy of lib/storage; the test server keeps its real store) and
// calls the services the routes call. Every upload path answers 503 with Retry-After and a plain
// sentence, and writes nothing; a raw file that lives only in the store cannot be fetched (503).

let deadPort = 0;
let user: { id: string };

beforeAll(async () => {
  // A port that was free a moment ago: connecting to it is refused at once.
  deadPort = await new Promise<number>((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
  process.env.S3_ENDPOINT = `http://127.0.0.1:${deadPort}`;
  user = await makeUser('contributor');
});
afterAll(() => closeSequelize());

async function refusal(p: Promise<unknown>) {
  const err = await p.then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(HttpError);
  const res = errorResponse(err);
  return { status: res.status, retryAfter: res.headers.get('retry-after'), body: (await res.json()) as { error: string } };
}

describe('uploads and downloads while the file store is down', () => {
  it('presign answers 503 with Retry-After, and keeps no stage', async () => {
    const { presignUpload } = await import('@/lib/storage/uploads');
    const before = await count('upload_stages', `user_id = '${user.id}'`);
    const started = Date.now();
    const r = await refusal(presignUpload(user.id, { name: 'a.csv', size: 10, sha256: 'a'.repeat(64) }));
    expect(r).toEqual({ status: 503, retryAfter: '5', body: expect.objectContaining({ error: 'The file store is briefly unavailable; nothing was saved. Try again in a few seconds.' }) });
    expect(Date.now() - started).toBeLessThan(5000);
    expect(await count('upload_stages', `user_id = '${user.id}'`)).toBe(before);
  });

  it('a multipart submission answers 503 and leaves no submission, file or curve', async () => {
    const { createSubmission } = await import('@/moderation/submissions');
    const file = singleCurve('down.csv');
    const before = await count('submissions', `contributor_id = '${user.id}'`);
    const r = await refusal(createSubmission({ id: user.id, role: 'contributor' }, metadataFor() as never, [{ name: file.name, bytes: Buffer.from(file.text as string) }], { notify: false }));
    expect(r.status).toBe(503);
    expect(r.retryAfter).toBe('5');
    expect(r.body.error).toMatch(/file store is briefly unavailable; nothing was saved/);
    expect(await count('submissions', `contributor_id = '${user.id}'`)).toBe(before);
  });

  it('a staged submission answers 503 while its files cannot be read back', async () => {
    const { takeStagedFiles } = await import('@/lib/storage/uploads');
    const [stage] = await query<{ id: string }>(
      `INSERT INTO upload_stages (user_id, original_name, size_bytes, sha256) VALUES (:userId, 'x.csv', 10, :sha) RETURNING id`,
      { userId: user.id, sha: createHash('sha256').update('0123456789').digest('hex') },
    );
    const r = await refusal(takeStagedFiles(user.id, [stage.id]));
    expect(r.status).toBe(503);
    expect(await count('upload_stages', `id = '${stage.id}'`)).toBe(1);
  });

  it('a raw file kept only in the store answers 503 with a sentence; one still in the database is served', async () => {
    const { rawFileBytes } = await import('@/lib/storage/uploads');
    const { STORE_DOWN_DOWNLOAD } = await import('@/lib/storage/errors');
    const r = await refusal(rawFileBytes({ content: null, sha256: 'd'.repeat(64), originalName: 'x.csv' }, STORE_DOWN_DOWNLOAD));
    expect(r.status).toBe(503);
    expect(r.body.error).toBe('The raw file cannot be fetched right now (the file store is unavailable). Try again in a few seconds.');
    const inRow = Buffer.from('kept in the row');
    expect((await rawFileBytes({ content: inRow, sha256: 'e'.repeat(64), originalName: 'y.csv' }, STORE_DOWN_DOWNLOAD)).equals(inRow)).toBe(true);
  });
});
