import { execFile } from 'node:child_process';
import net from 'node:net';
import { createHash, randomUUID } from 'node:crypto';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import { query } from '../support/db';
import { closeSequelize } from '@/db/connection';

// Backup and restore as an operator runs them: the two scripts, a fresh cluster, and a
// comparison of every table's row count and every verified curve's points and raw file.
const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, '../..');
// A port free at the moment of each restore, asked of the system: a fixed one inside the ephemeral range
// (32768–60999 here) can be held by one of the suite's own outgoing connections when the cluster starts.
function freePort(): Promise<string> {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(String(port)));
    });
  });
}
const work: string[] = [];

afterAll(async () => {
  await closeSequelize();
  await Promise.all(work.map((d) => rm(d, { recursive: true, force: true })));
});

async function scratch(name: string) {
  const dir = await mkdtemp(path.join(tmpdir(), `bandcone-${name}-`));
  work.push(dir);
  return dir;
}

// A bucket of its own on the same file store, so the restore puts every object and checks it there.
const freshBucket = () => `bandcone-restore-${randomUUID().slice(0, 8)}`;

// A cluster's folder must be reachable by the postgres user, so it goes under .data/ (not a private temp dir), made by the script.
function clusterDir() {
  const dir = path.join(root, '.data', `restore-test-${randomUUID().slice(0, 8)}`);
  work.push(dir);
  return dir;
}

describe('scripts/backup.sh and scripts/restore.sh', () => {
  it('restore into a fresh cluster reproduces every count, every verified curve and every raw file', async () => {
    const backup = await scratch('backup');
    const made = await run('bash', [path.join(root, 'scripts/backup.sh'), backup], { cwd: root, env: process.env, timeout: 120_000 });
    expect(made.stdout).toMatch(/backup in .* tables/);
    const fingerprint = await readFile(path.join(backup, 'fingerprint.txt'), 'utf8');
    // The fingerprint holds what the live database holds (nothing else writes during this file).
    const [{ n }] = await query<{ n: string }>("SELECT count(*)::text AS n FROM curves WHERE status = 'verified'");
    expect(Number(n)).toBeGreaterThan(0);
    expect(fingerprint).toMatch(/^raw-files-not-matching-their-sha256\|0$/m);
    expect(fingerprint).toMatch(/^verified-points\|[0-9a-f]{32}$/m);

    // The file store's raw files: one per stored file's hash, each written under its own SHA-256.
    const objects = (await readFile(path.join(backup, 'objects.txt'), 'utf8')).trim().split('\n');
    const [{ hashes }] = await query<{ hashes: string }>('SELECT count(DISTINCT sha256)::text AS hashes FROM submission_files WHERE content IS NULL');
    expect(objects.length).toBeGreaterThanOrEqual(Number(hashes));
    expect(Number(hashes)).toBeGreaterThan(0);
    const [first] = objects[0].split('|');
    const bytes = await readFile(path.join(backup, first));
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(first.slice('raw/'.length));

    const data = clusterDir();
    const restored = await run('bash', [path.join(root, 'scripts/restore.sh'), backup, '--data', data, '--port', await freePort(), '--bucket', freshBucket(), '--stop'], { cwd: root, env: process.env, timeout: 180_000 });
    expect(restored.stdout).toMatch(/every count and checksum equal/);
    expect(restored.stdout).toMatch(new RegExp(`file store: ${objects.length} raw objects put into bucket bandcone-restore-[0-9a-f]+ \\(0 already there\\), 0 rows without their bytes`));
  }, 300_000);

  it('a backup missing a raw file is reported by the restore, not passed', async () => {
    const backup = await scratch('backup-no-file');
    await run('bash', [path.join(root, 'scripts/backup.sh'), backup], { cwd: root, env: process.env, timeout: 120_000 });
    const [{ sha256 }] = await query<{ sha256: string }>('SELECT sha256 FROM submission_files WHERE content IS NULL ORDER BY id LIMIT 1');
    await rm(path.join(backup, 'raw', sha256));
    const data = clusterDir();
    const outcome = await run('bash', [path.join(root, 'scripts/restore.sh'), backup, '--data', data, '--port', await freePort(), '--bucket', freshBucket(), '--stop'], { cwd: root, env: process.env, timeout: 180_000 })
      .then(() => 'passed', (err: { stdout?: string; stderr?: string }) => `${err.stdout ?? ''}${err.stderr ?? ''}`);
    expect(outcome).toMatch(/is missing from bucket/);
    expect(outcome).toMatch(/the restored file store does NOT match/);
  }, 300_000);

  it('a restore that differs from its backup is reported, not passed', async () => {
    const backup = await scratch('backup-tampered');
    await run('bash', [path.join(root, 'scripts/backup.sh'), backup], { cwd: root, env: process.env, timeout: 120_000 });
    const file = path.join(backup, 'fingerprint.txt');
    // Claim one more verified-curve row than the dump holds: the check must catch it.
    const text = await readFile(file, 'utf8');
    await writeFile(file, text.replace(/^(rows:public\.curves\|)(\d+)$/m, (_, k: string, v: string) => `${k}${Number(v) + 1}`));
    const data = clusterDir();
    const outcome = await run('bash', [path.join(root, 'scripts/restore.sh'), backup, '--data', data, '--port', await freePort(), '--stop'], { cwd: root, env: process.env, timeout: 180_000 })
      .then(() => 'passed', (err: { stdout?: string }) => err.stdout ?? 'failed');
    expect(outcome).toMatch(/does NOT match/);
  }, 300_000);
});
