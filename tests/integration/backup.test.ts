import { execFile } from 'node:child_process';
import { randomUUID } from 'node:crypto';
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
const restorePort = String(Number(process.env.PGPORT ?? 54339) + 31);
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

    const data = clusterDir();
    const restored = await run('bash', [path.join(root, 'scripts/restore.sh'), backup, '--data', data, '--port', restorePort, '--stop'], { cwd: root, env: process.env, timeout: 180_000 });
    expect(restored.stdout).toMatch(/every count and checksum equal/);
  }, 300_000);

  it('a restore that differs from its backup is reported, not passed', async () => {
    const backup = await scratch('backup-tampered');
    await run('bash', [path.join(root, 'scripts/backup.sh'), backup], { cwd: root, env: process.env, timeout: 120_000 });
    const file = path.join(backup, 'fingerprint.txt');
    // Claim one more verified-curve row than the dump holds: the check must catch it.
    const text = await readFile(file, 'utf8');
    await writeFile(file, text.replace(/^(rows:public\.curves\|)(\d+)$/m, (_, k: string, v: string) => `${k}${Number(v) + 1}`));
    const data = clusterDir();
    const outcome = await run('bash', [path.join(root, 'scripts/restore.sh'), backup, '--data', data, '--port', restorePort, '--stop'], { cwd: root, env: process.env, timeout: 180_000 })
      .then(() => 'passed', (err: { stdout?: string }) => err.stdout ?? 'failed');
    expect(outcome).toMatch(/does NOT match/);
  }, 300_000);
});
