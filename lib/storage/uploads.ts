import { PutObjectCommand, HeadBucketCommand } from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { QueryTypes, type Transaction } from 'sequelize';
import { db } from '@/db/models';
import { HttpError, conflict, unprocessable } from '@/lib/http/errors';
import { overLimit } from '@/lib/rate-limit';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';
import type { PresignInput } from '@/lib/schemas/upload';
import { bucket, s3 } from './client';
import { STORE_DOWN_UPLOAD, guarded } from './errors';
import { copyStagedToRaw, putRawIfAbsent, rawKey, readCapped, remove, stagingKey } from './objects';

// Browser uploads go straight to the file store: the server names a staging key and signs a
// PUT to it; at submission it reads the staged object back (capped, hashed), refuses it unless
// it is exactly the file announced, copies it to raw/<sha256> and forgets the staging copy.

/** How long a presigned URL is good for. */
export const UPLOAD_URL_TTL_SECONDS = Number(process.env.UPLOAD_URL_TTL_SECONDS ?? 900);
/** Staged files nobody submitted are swept after this long. */
export const STAGE_MAX_AGE_SECONDS = Number(process.env.UPLOAD_STAGE_MAX_AGE_SECONDS ?? 24 * 3600);
/** Presigned URLs one contributor may ask for a minute (a submission holds at most 20 files). */
export const PRESIGN_PER_MINUTE = Number(process.env.PRESIGN_RATE_PER_MINUTE ?? 60);

export type Presigned = { uploadId: string; method: 'PUT'; url: string; headers: Record<string, string>; expiresAt: string };

export async function presignUpload(userId: string, input: PresignInput, ttlSeconds = UPLOAD_URL_TTL_SECONDS): Promise<Presigned> {
  if (await overLimit(`presign:${userId}`, PRESIGN_PER_MINUTE, 60)) {
    throw new HttpError(429, `At most ${PRESIGN_PER_MINUTE} files a minute; wait a minute and send the rest.`);
  }
  // Signing needs no network; asking the bucket first turns an outage into a 503 now, not a failed PUT later.
  await guarded(STORE_DOWN_UPLOAD, () => s3().send(new HeadBucketCommand({ Bucket: bucket() })));
  const [row] = await db().sequelize.query<{ id: string }>(
    `INSERT INTO upload_stages (user_id, original_name, size_bytes, sha256, media_type) VALUES (:userId, :name, :size, :sha256, :type) RETURNING id`,
    { replacements: { userId, name: input.name, size: input.size, sha256: input.sha256, type: input.type || 'text/plain' }, type: QueryTypes.SELECT },
  );
  // content-length is signed: a real S3 refuses a body of any other length at the door.
  const url = await getSignedUrl(
    s3(),
    new PutObjectCommand({ Bucket: bucket(), Key: stagingKey(row.id), ContentLength: input.size }),
    { expiresIn: ttlSeconds, signableHeaders: new Set(['content-length']) },
  );
  return { uploadId: row.id, method: 'PUT', url, headers: {}, expiresAt: new Date(Date.now() + ttlSeconds * 1000).toISOString() };
}

type Stage = { id: string; original_name: string; size_bytes: number; sha256: string; media_type: string };
export type StagedFile = { name: string; bytes: Buffer; mediaType: string; uploadId: string };

/**
 * The announced files, read back from the file store and checked: each must be there, be the
 * size announced and hash to the SHA-256 announced. A refusal names the file and says why; a
 * staged copy that arrived different is dropped at once (it can never be submitted).
 */
export async function takeStagedFiles(userId: string, uploadIds: string[]): Promise<StagedFile[]> {
  if (new Set(uploadIds).size !== uploadIds.length) throw unprocessable('The same upload is named twice; name each file once.');
  const stages = await db().sequelize.query<Stage>(
    `SELECT id, original_name, size_bytes, sha256, media_type FROM upload_stages WHERE id IN (:ids) AND user_id = :userId`,
    { replacements: { ids: uploadIds.length ? uploadIds : ['00000000-0000-0000-0000-000000000000'], userId }, type: QueryTypes.SELECT },
  );
  const byId = new Map(stages.map((s) => [s.id, s]));
  const files: StagedFile[] = [];
  for (const id of uploadIds) {
    const stage = byId.get(id);
    if (!stage) throw unprocessable(`Upload ${id} is not one of yours, or it waited too long and was swept; upload the file again.`);
    const got = await guarded(STORE_DOWN_UPLOAD, () => readCapped(stagingKey(id), MAX_FILE_BYTES));
    const name = stage.original_name;
    if (got === null) {
      throw unprocessable(`${name}: never arrived in the file store (its upload did not finish, or its signed address had expired); nothing was submitted. Send the file again.`);
    }
    let problem: string | null = null;
    if ('tooLarge' in got) problem = `${name}: arrived larger than the 5 MB limit; nothing was submitted.`;
    else if (got.bytes.length !== stage.size_bytes) problem = `${name}: arrived as ${got.bytes.length} bytes, not the ${stage.size_bytes} announced; nothing was submitted. Send the file again.`;
    else if (got.sha256 !== stage.sha256) problem = `${name}: arrived different from the file announced (its SHA-256 does not match); nothing was submitted. Send the file again.`;
    if (problem || 'tooLarge' in got) {
      await dropStage(id);
      // The sentence starts with the file's name, so the upload page shows it beside that file.
      throw unprocessable(problem as string);
    }
    files.push({ name, bytes: got.bytes, mediaType: stage.media_type, uploadId: id });
  }
  return files;
}

/** Puts checked files at raw/<sha256>, never overwriting; a staged one is copied inside the store. */
export async function storeRawFiles(files: { sha256: string; bytes: Buffer; uploadId?: string }[]): Promise<void> {
  await guarded(STORE_DOWN_UPLOAD, async () => {
    for (const f of files) {
      if (f.uploadId) await copyStagedToRaw(f.uploadId, f.sha256);
      else await putRawIfAbsent(f.sha256, f.bytes);
    }
  });
}

/**
 * In the submission's transaction: the stages it took are gone with it, or stay if it fails.
 * Two submissions naming the same upload at once cannot both take it: the second finds it gone.
 */
export async function forgetStages(uploadIds: string[], transaction: Transaction): Promise<void> {
  if (uploadIds.length === 0) return;
  const gone = await db().sequelize.query<{ id: string }>(`DELETE FROM upload_stages WHERE id IN (:ids) RETURNING id`, { replacements: { ids: uploadIds }, transaction, type: QueryTypes.SELECT });
  if (gone.length !== uploadIds.length) throw conflict('These files were just submitted by another request; nothing was submitted twice.');
}

/** After the commit: the staging copies are no longer needed. A failure is left to the sweep. */
export async function removeStagedObjects(uploadIds: string[]): Promise<void> {
  await Promise.all(uploadIds.map((id) => remove(stagingKey(id)).catch(() => undefined)));
}

async function dropStage(id: string) {
  await remove(stagingKey(id)).catch(() => undefined);
  await db().sequelize.query(`DELETE FROM upload_stages WHERE id = :id`, { replacements: { id } });
}

/**
 * The bytes of a stored raw file: from the file store at raw/<sha256>, or from the row for a
 * file that has not been moved there yet. The store being away is a 503 (with `sentence`).
 */
export async function rawFileBytes(file: { content?: Buffer | null; sha256: string; originalName: string }, sentence: string): Promise<Buffer> {
  if (file.content) return file.content;
  const got = await guarded(sentence, () => readCapped(rawKey(file.sha256), MAX_FILE_BYTES));
  if (got === null || 'tooLarge' in got) {
    throw new HttpError(404, `The bytes of ${file.originalName} are missing from the file store; an operator must restore them from a backup (scripts/restore.sh).`);
  }
  return got.bytes;
}
