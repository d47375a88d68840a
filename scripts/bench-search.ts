// Fires a fixed mix of catalogue searches (text, parametric, fitness) at a running server
// through HTTP and prints p50/p95 latency, throughput and the server's memory against the
// targets: p95 ≤ 80 ms for each kind, server RSS ≤ 500 MB.
//   npm run bench:search -- [--url http://127.0.0.1:3000] [--duration 20] [--connections 4] [--pid <server pid>] [--cold] [--kinds text,fitness]
// The public catalogue's totals and facet counts are kept for 30 s per distinct search (paging and
// re-sorting ask for them again); --cold makes every request a distinct search, so none is reused.
// Point the server at the scale database first (npm run seed:scale, then DATABASE_URL=… next start).
import { execFileSync } from 'node:child_process';
import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';

// autocannon ships no types; this is the part of its API used here.
type Instance = PromiseLike<{ errors: number; timeouts: number }> & {
  on(event: 'response', fn: (client: unknown, status: number, bytes: number, ms: number) => void): void;
};
type Req = { method: string; path: string; setupRequest?: (req: { path: string }) => { path: string } };
type Autocannon = (opts: { url: string; connections: number; duration: number; requests: Req[]; headers: Record<string, string> }) => Instance;
const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

function arg(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  if (i >= 0 && process.argv[i + 1]) return process.argv[i + 1];
  return process.env[`BENCH_${name.toUpperCase()}`] ?? fallback;
}

const BASE = arg('url', 'http://127.0.0.1:3000').replace(/\/$/, '');
const DURATION = Number(arg('duration', '20'));
const CONNECTIONS = Number(arg('connections', '4'));
const WARMUP = 3;
const TARGET_P95_MS = 80;
const TARGET_RSS_MB = 500;
const COLD = process.argv.includes('--cold');
const ONLY = arg('kinds', '').split(',').filter(Boolean);
let counter = 0;

// The fixed mix. Each connection walks its list in order and starts again.
const KINDS: Record<string, string[]> = {
  text: [
    'q=meadow',
    'q=hydrogen+alpha',
    'q=oxygen+2.5nm',
    'q=harbour+lantern',
    'q=sulphur+spectrograph',
    'q=beacon+heath',
    'q=%22ion-assisted%22+quarry',
    'q=Vantrell+Quillon',
    'q=weir+-orchard',
    'q=Tarn+5nm&sort=cwl',
  ],
  parametric: [
    'line=Ha&fwhmMax=5',
    'cwlMin=495&cwlMax=505&peakMin=0.85',
    'line=SII-671&method=spectrograph',
    'fwhmMin=6&fwhmMax=13&sort=fwhm',
    'line=OIII&fwhmMax=4&page=3',
    'aoiMin=1&sort=cwl',
    'line=Hb&sort=peak',
    'method=monochromator&fwhmMax=7&sort=newest',
    'line=Ha&cwlMin=656&cwlMax=657.5&sort=fwhm&pageSize=50',
    'peakMin=0.93&sort=peak&dir=asc',
  ],
  fitness: [
    'line=Ha&fwhmMax=5&fNumber=2.5&obstruction=0.36&minThroughput=0.85&sort=throughput',
    'line=OIII&fNumber=1.8&obstruction=0.42&sort=throughput',
    'line=Ha&fNumber=1.6&minThroughput=0.7',
    'line=SII-671&fNumber=5&obstruction=0.25&minThroughput=0.5&sort=throughput',
    'line=Ha&fNumber=3.6&fieldAngleDeg=4&minThroughput=0.8',
    'line=Hb&fNumber=5&obstruction=0.25&minThroughput=0.6&sort=throughput',
    'line=OIII&fwhmMax=7&fNumber=1.6&minThroughput=0.5&sort=throughput',
    'line=Ha&fNumber=8.5&obstruction=0.3&minThroughput=0.85&sort=throughput',
    'fNumber=2.5&obstruction=0.36&minThroughput=0.8&sort=throughput',
    'line=Ha&fNumber=1.8&obstruction=0.42&nEff=1.8&minThroughput=0.6&sort=throughput',
  ],
};

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

/** The process listening on the server's port, and its children (Next serves from a child). */
function serverPids(): number[] {
  const given = arg('pid', '');
  const port = new URL(BASE).port || '80';
  let root = given ? Number(given) : NaN;
  if (!Number.isFinite(root)) {
    try {
      const out = execFileSync('ss', ['-ltnpH', `sport = :${port}`], { encoding: 'utf8' });
      const m = out.match(/pid=(\d+)/);
      if (m) root = Number(m[1]);
    } catch {
      return [];
    }
  }
  if (!Number.isFinite(root)) return [];
  const pids = [root];
  // walk /proc for descendants
  const parents = new Map<number, number>();
  for (const d of readdirSync('/proc')) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      parents.set(Number(d), ppid);
    } catch {
      /* gone */
    }
  }
  for (let grew = true; grew; ) {
    grew = false;
    for (const [pid, ppid] of parents) if (pids.includes(ppid) && !pids.includes(pid)) (pids.push(pid), (grew = true));
  }
  return pids;
}

function rssMb(pids: number[]): number {
  let kb = 0;
  for (const pid of pids) {
    try {
      const m = readFileSync(`/proc/${pid}/status`, 'utf8').match(/VmRSS:\s+(\d+)/);
      if (m) kb += Number(m[1]);
    } catch {
      /* exited */
    }
  }
  return kb / 1024;
}

async function run(kind: string, paths: string[], seconds: number) {
  const latencies: number[] = [];
  let errors = 0;
  const instance = autocannon({
    url: BASE,
    connections: CONNECTIONS,
    duration: seconds,
    requests: paths.map((p) => ({
      method: 'GET',
      path: `/api/curves?${p}`,
      // a vanishing peak minimum changes nothing in the answer but makes the search new
      ...(COLD ? { setupRequest: (req: { path: string }) => ({ ...req, path: `/api/curves?${p}&peakMin=${((++counter % 900000) * 1e-12).toFixed(15)}` }) } : {}),
    })),
    headers: { accept: 'application/json' },
  });
  instance.on('response', (_client, status, _bytes, ms) => {
    latencies.push(ms);
    if (status >= 400) errors++;
  });
  const result = await instance;
  latencies.sort((a, b) => a - b);
  return { kind, requests: latencies.length, rps: latencies.length / seconds, p50: percentile(latencies, 50), p95: percentile(latencies, 95), p99: percentile(latencies, 99), max: latencies[latencies.length - 1], errors: errors + result.errors + result.timeouts };
}

async function main() {
  const probe = await fetch(`${BASE}/api/curves?pageSize=1`).catch(() => null);
  if (!probe?.ok) throw new Error(`No catalogue at ${BASE} (GET /api/curves answered ${probe?.status ?? 'nothing'}); start the server first.`);
  const { total } = (await probe.json()) as { total: number };
  const pids = serverPids();
  console.log(`bench:search against ${BASE}: ${total.toLocaleString('en-US')} verified curves, ${CONNECTIONS} connections, ${DURATION} s per kind (after ${WARMUP} s warm-up)${COLD ? ', every search distinct (no reused counts)' : ''}`);
  if (pids.length === 0) console.log('  (server process not found: pass --pid to report its memory)');

  let peak = rssMb(pids);
  const sampler = setInterval(() => (peak = Math.max(peak, rssMb(pids))), 250);
  const rows = [];
  for (const [kind, paths] of Object.entries(KINDS)) {
    if (ONLY.length > 0 && !ONLY.includes(kind)) continue;
    await run(kind, paths, WARMUP);
    rows.push(await run(kind, paths, DURATION));
  }
  clearInterval(sampler);
  peak = Math.max(peak, rssMb(pids));

  const pad = (s: string, n: number) => s.padStart(n);
  console.log(`\n${'kind'.padEnd(11)}${pad('requests', 9)}${pad('req/s', 8)}${pad('p50 ms', 8)}${pad('p95 ms', 8)}${pad('p99 ms', 8)}${pad('max ms', 8)}${pad('errors', 7)}  p95 ≤ ${TARGET_P95_MS} ms`);
  let ok = true;
  for (const r of rows) {
    const pass = r.p95 <= TARGET_P95_MS && r.errors === 0;
    ok &&= pass;
    console.log(
      `${r.kind.padEnd(11)}${pad(String(r.requests), 9)}${pad(r.rps.toFixed(1), 8)}${pad(r.p50.toFixed(1), 8)}${pad(r.p95.toFixed(1), 8)}${pad(r.p99.toFixed(1), 8)}${pad(r.max.toFixed(0), 8)}${pad(String(r.errors), 7)}  ${pass ? 'PASS' : 'FAIL'}`,
    );
  }
  if (pids.length) {
    const pass = peak <= TARGET_RSS_MB;
    ok &&= pass;
    console.log(`\nserver RSS peak ${peak.toFixed(0)} MB (pids ${pids.join(', ')})  ≤ ${TARGET_RSS_MB} MB  ${pass ? 'PASS' : 'FAIL'}`);
  }
  console.log(ok ? '\nall targets met' : '\nsome targets missed');
  process.exitCode = ok ? 0 : 1;
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(2);
});
