// The file store's part of a backup (scripts/backup.sh, scripts/restore.sh).
//   npx tsx scripts/bucket-backup.ts dump DIR --database-url URL
//   npx tsx scripts/bucket-backup.ts restore DIR --database-url URL
// dump: every raw/<sha256> object into DIR/raw/, each checked against its name, plus
// DIR/objects.txt ("key|size", sorted). It runs after the database dump: raw objects are written
// before any row names them and are never deleted or rewritten, so every row in the dump has
// its object in the copy. restore: puts the objects into the bucket S3_BUCKET names (made if
// missing, nothing overwritten), then checks that every row of the restored database whose
// bytes are not in the row has its object there, hashing to the row's sha256.
import { createHash } from 'node:crypto';
import { mkdir, readdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { QueryTypes, Sequelize } from 'sequelize';
import pg from 'pg';
import { CreateBucketCommand } from '@aws-sdk/client-s3';
import { bucket, s3 } from '@/lib/storage/client';
import { storageConfig } from '@/lib/storage/config';
import { isStorageUnavailable } from '@/lib/storage/errors';
import { list, putRawIfAbsent, rawKey, readCapped } from '@/lib/storage/objects';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';

const [mode, dir] = process.argv.slice(2);
const urlAt = process.argv.indexOf('--database-url');
const databaseUrl = urlAt > 0 ? process.argv[urlAt + 1] : process.env.DATABASE_URL;
if (!['dump', 'restore'].includes(mode) || !dir || !databaseUrl) {
  console.error('usage: bucket-backup.ts dump|restore DIR --database-url URL');
  process.exit(2);
}
const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
const HEX64 = /^[0-9a-f]{64}$/;

async function rowsInStore(): Promise<{ id: number; sha256: string }[]> {
  const db = new Sequelize(databaseUrl as string, { dialect: 'postgres', dialectModule: pg, logging: false });
  try {
    return await db.query<{ id: number; sha256: string }>('SELECT id, sha256 FROM submission_files WHERE content IS NULL ORDER BY id', { type: QueryTypes.SELECT });
  } finally {
    await db.close();
  }
}

async function dump(): Promise<number> {
  const out = path.join(dir, 'raw');
  await mkdir(out, { recursive: true });
  const lines: string[] = [];
  let bad = 0;
  for await (const o of list('raw/')) {
    const name = o.key.slice('raw/'.length);
    if (!HEX64.test(name)) continue;
    const got = await readCapped(o.key, MAX_FILE_BYTES);
    if (!got || 'tooLarge' in got || got.sha256 !== name) {
      console.error(`  ${o.key}: its bytes do not hash to its name; not copied`);
      bad++;
      continue;
    }
    await writeFile(path.join(out, name), got.bytes);
    lines.push(`${o.key}|${got.bytes.length}`);
  }
  lines.sort();
  await writeFile(path.join(dir, 'objects.txt'), lines.join('\n') + (lines.length ? '\n' : ''));
  const have = new Set(lines.map((l) => l.slice('raw/'.length, 'raw/'.length + 64)));
  const missing = (await rowsInStore()).filter((r) => !have.has(r.sha256));
  for (const m of missing) console.error(`  file ${m.id}: raw/${m.sha256} is not in the file store`);
  console.log(`file store: ${lines.length} raw objects copied (${bad} damaged, ${missing.length} rows without their object)`);
  return bad + missing.length ? 1 : 0;
}

async function restore(): Promise<number> {
  await s3().send(new CreateBucketCommand({ Bucket: bucket() })).catch((err: { name?: string }) => {
    if (err.name !== 'BucketAlreadyOwnedByYou' && err.name !== 'BucketAlreadyExists') throw err;
  });
  const from = path.join(dir, 'raw');
  const names = (await readdir(from).catch(() => [] as string[])).filter((n) => HEX64.test(n));
  let put = 0;
  for (const name of names) {
    const bytes = await readFile(path.join(from, name));
    if (sha256(bytes) !== name) {
      console.error(`  backup file raw/${name} does not hash to its name; not restored`);
      continue;
    }
    if ((await putRawIfAbsent(name, bytes)) === 'stored') put++;
  }
  const problems: string[] = [];
  for (const row of await rowsInStore()) {
    const got = await readCapped(rawKey(row.sha256), MAX_FILE_BYTES);
    if (!got || 'tooLarge' in got) problems.push(`file ${row.id}: raw/${row.sha256} is missing from bucket ${bucket()}`);
    else if (got.sha256 !== row.sha256) problems.push(`file ${row.id}: raw/${row.sha256} holds other bytes`);
  }
  for (const p of problems) console.error(`  ${p}`);
  console.log(`file store: ${put} raw objects put into bucket ${bucket()} (${names.length - put} already there), ${problems.length} rows without their bytes`);
  return problems.length ? 1 : 0;
}

try {
  process.exitCode = mode === 'dump' ? await dump() : await restore();
} catch (err) {
  if (!isStorageUnavailable(err)) throw err;
  console.error(`cannot reach the file store at ${storageConfig().endpoint} (bucket ${storageConfig().bucket}); raw files were not ${mode === 'dump' ? 'backed up' : 'restored'}.`);
  process.exitCode = 2;
}
