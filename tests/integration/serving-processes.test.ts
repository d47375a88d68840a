import { spawn, type ChildProcess } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

// WEB_CONCURRENCY=2: our server (server.ts) forks two serving processes on one port, replaces one
// that dies, and stops them all on SIGTERM. A second server of the built app, on a port of its own.
const root = path.resolve(import.meta.dirname, '../..');
const port = Number(process.env.PORT ?? 3100) + 47;
const base = `http://127.0.0.1:${port}`;
let server: ChildProcess | null = null;

afterAll(() => {
  if (server?.pid) {
    try {
      process.kill(-server.pid, 'SIGKILL');
    } catch {
      /* already gone */
    }
  }
});

function childrenOf(pid: number): number[] {
  const out: number[] = [];
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      if (Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]) === pid) out.push(Number(d));
    } catch {
      /* gone */
    }
  }
  return out;
}

async function until<T>(what: string, seconds: number, probe: () => Promise<T | null> | T | null): Promise<T> {
  const deadline = Date.now() + seconds * 1000;
  for (;;) {
    const value = await probe();
    if (value !== null) return value;
    if (Date.now() > deadline) throw new Error(`${what} did not happen within ${seconds} s`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

const answers = async () => {
  try {
    const res = await fetch(`${base}/api/lines`, { signal: AbortSignal.timeout(3000) });
    return res.status === 200 ? true : null;
  } catch {
    return null;
  }
};

describe('several serving processes (WEB_CONCURRENCY)', () => {
  it('serves from two processes, replaces one that dies, and stops them all on SIGTERM', async () => {
    // the server as the scripts serve it: bundled into the build folder (scripts/build-server.mjs)
    server = spawn(process.execPath, [path.join(process.env.NEXT_DIST_DIR ?? '.next', 'bandcone-server', 'server.mjs'), '-H', '127.0.0.1', '-p', String(port)], {
      cwd: root,
      detached: true,
      stdio: 'ignore',
      env: {
        ...process.env,
        NODE_ENV: 'production',
        WEB_CONCURRENCY: '2',
        MAIL_WORKER: '0',
        APP_DATABASE_URL: process.env.TEST_APP_DATABASE_URL ?? process.env.DATABASE_URL,
      },
    });
    const primary = server.pid!;
    await until('the server answering', 90, answers);
    const first = await until('two serving processes', 30, () => {
      const kids = childrenOf(primary);
      return kids.length === 2 ? kids : null;
    });

    // Both processes take requests: the port is shared round-robin, so a few answers reach each.
    const results = await Promise.all(Array.from({ length: 20 }, () => answers()));
    expect(results.every(Boolean)).toBe(true);

    process.kill(first[0], 'SIGKILL');
    const replaced = await until('a replacement process', 60, () => {
      const kids = childrenOf(primary);
      return kids.length === 2 && !kids.includes(first[0]) ? kids : null;
    });
    expect(replaced).toContain(first[1]);
    await until('answers after the replacement', 60, answers);

    process.kill(primary, 'SIGTERM');
    await until('every process gone', 15, () => (childrenOf(primary).length === 0 && server!.exitCode !== null ? true : null));
    expect(server.exitCode).toBe(0);
  }, 240_000);
});
