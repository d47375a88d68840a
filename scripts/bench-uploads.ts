// Upload throughput through the file store, the browser's way and the API's way.
//   npm run bench:uploads -- --url http://127.0.0.1:3000 [--files 40] [--kb 1000] [--concurrency 4]
//     [--email contributor@bandcone.test] [--password …]
// Browser way, per file: presign (POST /api/uploads/presign), PUT to the presigned URL, then a
// JSON submission naming it (the server reads it back, checks size and SHA-256, copies it to
// raw/<sha256>). API way: one multipart POST per file (the server puts it in the bucket). Prints
// files/s, MB/s and p50/p95 per step. The submissions it makes are removed afterwards when
// DATABASE_URL (the owner's) is set; their raw objects stay (content-addressed, harmless).
// The server's presign limit is 60 a minute per contributor: start it with PRESIGN_RATE_PER_MINUTE
// raised for runs of more files.
import { createHash } from 'node:crypto';
import { Sequelize } from 'sequelize';
import pg from 'pg';
import { percentile } from './bench-support';
import { signIn } from './lib/sign-in';
import { curveCsv, metadataFor } from '../tests/integration/submissions-fixtures';
import { pool } from './lib/pool';

function arg(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? process.argv[i + 1] : fallback;
}
const url = arg('url', 'http://127.0.0.1:3000').replace(/\/$/, '');
const files = Number(arg('files', '40'));
const kb = Number(arg('kb', '1000'));
const concurrency = Number(arg('concurrency', '4'));
const email = arg('email', 'contributor@bandcone.test');
const password = arg('password', process.env.DEMO_PASSWORD ?? 'bandcone-demo');

/** A measured-looking curve of about `kb` KB: 0.01 nm steps over as wide a range as that takes. */
const BYTES_PER_ROW = curveCsv({ noiseSeed: 1 }).length / 801;
function curveOfSize(seed: number): Buffer {
  const rows = Math.max(200, Math.round((kb * 1024) / BYTES_PER_ROW));
  const from = 656.3 - (rows * 0.01) / 2;
  return Buffer.from(curveCsv({ fromNm: from, toNm: from + rows * 0.01, stepNm: 0.01, noiseSeed: seed }));
}

type Timing = { total: number; steps: Record<string, number> };


async function timed<T>(steps: Record<string, number>, name: string, fn: () => Promise<T>): Promise<T> {
  const t = performance.now();
  try {
    return await fn();
  } finally {
    steps[name] = performance.now() - t;
  }
}

async function main() {
  const seed0 = Date.now() % 1_000_000;
  const bodies = Array.from({ length: files * 2 }, (_, i) => curveOfSize(seed0 + i * 7919));
  // After the files are made: a connection idle past the server's keep-alive timeout would be closed under the first request.
  const cookie = await signIn(url, email, password);
  if (!cookie) throw new Error(`could not sign in as ${email}`);
  const headers = { cookie, origin: new URL(url).origin };
  const made: number[] = [];
  const mb = (n: number) => (n * bodies[0].length) / 1048576;
  console.log(`bench:uploads — ${files} files of ${(bodies[0].length / 1024).toFixed(0)} KB each way, ${concurrency} at once, against ${url}`);

  const browserWay = async (bytes: Buffer, i: number): Promise<Timing> => {
    const steps: Record<string, number> = {};
    const t = performance.now();
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const p = await timed(steps, 'presign', async () => {
      const res = await fetch(`${url}/api/uploads/presign`, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify({ name: `bench-${i}.csv`, size: bytes.length, sha256 }) });
      if (res.status !== 201) throw new Error(`presign answered ${res.status}: ${await res.text()}`);
      return (await res.json()) as { url: string; uploadId: string; headers: Record<string, string> };
    });
    await timed(steps, 'put', async () => {
      const res = await fetch(p.url, { method: 'PUT', body: new Uint8Array(bytes), headers: p.headers });
      if (!res.ok) throw new Error(`PUT answered ${res.status}`);
    });
    await timed(steps, 'submit', async () => {
      const res = await fetch(`${url}/api/submissions`, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify({ metadata: metadataFor({ label: 'Bench upload Hα' }), uploads: [p.uploadId] }) });
      if (res.status !== 201) throw new Error(`submission answered ${res.status}: ${await res.text()}`);
      made.push(((await res.json()) as { id: number }).id);
    });
    return { total: performance.now() - t, steps };
  };

  const apiWay = async (bytes: Buffer, i: number): Promise<Timing> => {
    const steps: Record<string, number> = {};
    const t = performance.now();
    await timed(steps, 'multipart', async () => {
      const form = new FormData();
      form.append('metadata', JSON.stringify(metadataFor({ label: 'Bench upload Hα' })));
      form.append('file', new Blob([new Uint8Array(bytes)], { type: 'text/csv' }), `bench-api-${i}.csv`);
      const res = await fetch(`${url}/api/submissions`, { method: 'POST', headers, body: form });
      if (res.status !== 201) throw new Error(`multipart submission answered ${res.status}: ${await res.text()}`);
      made.push(((await res.json()) as { id: number }).id);
    });
    return { total: performance.now() - t, steps };
  };

  const report = (name: string, timings: Timing[], seconds: number) => {
    const line = (label: string, xs: number[]) => {
      const s = [...xs].sort((a, b) => a - b);
      return `${label} p50 ${percentile(s, 50).toFixed(0)} ms, p95 ${percentile(s, 95).toFixed(0)} ms`;
    };
    console.log(`\n${name}: ${timings.length} files in ${seconds.toFixed(1)} s — ${(timings.length / seconds).toFixed(1)} files/s, ${(mb(timings.length) / seconds).toFixed(1)} MB/s`);
    console.log(`  ${line('whole file', timings.map((t) => t.total))}`);
    for (const step of Object.keys(timings[0].steps)) console.log(`  ${line(step, timings.map((t) => t.steps[step]))}`);
  };

  const bucketOnly = async (bytes: Buffer, i: number): Promise<Timing> => {
    const steps: Record<string, number> = {};
    const t = performance.now();
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const res = await fetch(`${url}/api/uploads/presign`, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify({ name: `bench-put-${i}.csv`, size: bytes.length, sha256 }) });
    if (res.status !== 201) throw new Error(`presign answered ${res.status}: ${await res.text()}`);
    const p = (await res.json()) as { url: string; headers: Record<string, string> };
    await timed(steps, 'put', async () => {
      const put = await fetch(p.url, { method: 'PUT', body: new Uint8Array(bytes), headers: p.headers });
      if (!put.ok) throw new Error(`PUT answered ${put.status}`);
    });
    return { total: performance.now() - t, steps };
  };

  try {
    let t = performance.now();
    const puts = await pool(bodies.slice(0, files).map((b, i) => () => bucketOnly(b, i)), concurrency);
    report('bucket alone (presign + PUT, nothing submitted; the sweep drops these)', puts, (performance.now() - t) / 1000);
    t = performance.now();
    const browser = await pool(bodies.slice(0, files).map((b, i) => () => browserWay(b, i)), concurrency);
    report('browser way (presign → PUT to the bucket → submit)', browser, (performance.now() - t) / 1000);
    t = performance.now();
    const api = await pool(bodies.slice(files).map((b, i) => () => apiWay(b, i)), concurrency);
    report('API way (multipart to the server, which puts it in the bucket)', api, (performance.now() - t) / 1000);
  } finally {
    if (process.env.DATABASE_URL && made.length) {
      const owner = new Sequelize(process.env.DATABASE_URL, { dialect: 'postgres', dialectModule: pg, logging: false });
      await owner.transaction(async (transaction) => {
        await owner.query('DELETE FROM curves WHERE submission_id IN (:ids)', { replacements: { ids: made }, transaction });
        await owner.query('DELETE FROM submissions WHERE id IN (:ids)', { replacements: { ids: made }, transaction });
      });
      await owner.close();
      console.log(`\nremoved the ${made.length} bench submissions`);
    } else if (made.length) {
      console.log(`\n${made.length} bench submissions stay in the review queue (set DATABASE_URL to remove them)`);
    }
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
