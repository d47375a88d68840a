import { createHash } from 'node:crypto';
import type { Readable } from 'node:stream';
import {
  CopyObjectCommand, DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, ListObjectsV2Command, PutObjectCommand,
} from '@aws-sdk/client-s3';
import { bucket, s3 } from './client';
import { isMissingObject } from './errors';

// The bucket's layout: `raw/<sha256>` holds each distinct raw file once, written once and never
// overwritten (the database rows name it by their sha256, which migration 0012 keeps fixed);
// `staging/<uploadId>` holds what a browser sent with a presigned URL until a submission takes it.

export const rawKey = (sha256: string) => `raw/${sha256}`;
export const stagingKey = (uploadId: string) => `staging/${uploadId}`;
export const STAGING_PREFIX = 'staging/';

export async function exists(key: string): Promise<boolean> {
  try {
    await s3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }));
    return true;
  } catch (err) {
    if (isMissingObject(err)) return false;
    throw err;
  }
}

/** Puts bytes at `raw/<sha256>` unless that object is already there (the same bytes, by its name). */
export async function putRawIfAbsent(sha256: string, bytes: Buffer): Promise<'stored' | 'present'> {
  const key = rawKey(sha256);
  if (await exists(key)) return 'present';
  await s3().send(new PutObjectCommand({ Bucket: bucket(), Key: key, Body: bytes, ContentLength: bytes.length, ContentType: 'application/octet-stream' }));
  return 'stored';
}

/** Copies a checked staging object to `raw/<sha256>` unless that object is already there. */
export async function copyStagedToRaw(uploadId: string, sha256: string): Promise<'stored' | 'present'> {
  const key = rawKey(sha256);
  if (await exists(key)) return 'present';
  await s3().send(new CopyObjectCommand({ Bucket: bucket(), Key: key, CopySource: `${bucket()}/${stagingKey(uploadId)}`, MetadataDirective: 'REPLACE', ContentType: 'application/octet-stream' }));
  return 'stored';
}

export type Fetched = { bytes: Buffer; sha256: string } | { tooLarge: true; seen: number } | null;

/**
 * Reads an object while hashing it, and stops at `cap` bytes: whatever a presigned PUT put
 * there, no more than the cap is ever held. Null when there is no such object.
 */
export async function readCapped(key: string, cap: number): Promise<Fetched> {
  let body: Readable;
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    body = out.Body as Readable;
  } catch (err) {
    if (isMissingObject(err)) return null;
    throw err;
  }
  const hash = createHash('sha256');
  const chunks: Buffer[] = [];
  let seen = 0;
  for await (const chunk of body) {
    const b = chunk as Buffer;
    seen += b.length;
    if (seen > cap) {
      body.destroy();
      return { tooLarge: true, seen };
    }
    hash.update(b);
    chunks.push(b);
  }
  return { bytes: Buffer.concat(chunks, seen), sha256: hash.digest('hex') };
}

export async function remove(key: string): Promise<void> {
  await s3().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }));
}

/** Every object under `prefix`, page by page: its key, size and when it was written. */
export async function* list(prefix: string): AsyncGenerator<{ key: string; size: number; lastModified: Date }> {
  let token: string | undefined;
  do {
    const page = await s3().send(new ListObjectsV2Command({ Bucket: bucket(), Prefix: prefix, ContinuationToken: token, MaxKeys: 1000 }));
    for (const o of page.Contents ?? []) if (o.Key) yield { key: o.Key, size: o.Size ?? 0, lastModified: o.LastModified ?? new Date(0) };
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
}
