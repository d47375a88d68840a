// Fifty visitors on a realistic mix, each thinking about a second between requests (about
// 50 requests a second in all), then more visitors until p95 passes 500 ms. Visitors are loops
// of their own: autocannon's fixed rate sends each second's requests in one burst, which no crowd
// of people does. They send through node:http on kept-alive connections, not fetch: on this one
// machine the visitors share the server's two cores, and fetch cost them three times the CPU.
//   npm run check:load -- [--url http://127.0.0.1:3000] [--visitors 50] [--seconds 60] [--pid <server pid>] [--no-ramp] [--fresh-searches]
// The server keeps a signed-out visitor's search answer under the catalogue version (up to 5 min)
// (lib/catalogue/count-cache.ts), so the mix's repeated searches are mostly answered from memory,
// as a public library's popular searches are. --fresh-searches makes every search a new one (a
// distinct, harmless peak threshold below 0.1 %), so each is worked out: the figure without keeping.
// Point the server at the 100 000-curve database first (npm run seed:scale; DEVELOPERS.md says how).
// Targets on the 2-core machine: p95 ≤ 150 ms for pages and searches, ≤ 50 ms for the model call
// on a stored curve, no errors, server memory ≤ 1 GB.
import { Agent, request as httpRequest } from 'node:http';
import { memorySampler, percentile, serverPids } from './bench-support';

function arg(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}
const BASE = arg('url', 'http://127.0.0.1:3000').replace(/\/$/, '');
const VISITORS = Number(arg('visitors', '50'));
const SECONDS = Number(arg('seconds', '60'));
const RAMP = !process.argv.includes('--no-ramp');
const FRESH = process.argv.includes('--fresh-searches');
const THINK_S = 1;
const TARGET_MEMORY_MB = 1024;
const SATURATION_P95_MS = 500;

// Optics of the demo world's own line-up (no pair here stands for a real instrument).
const OPTICS = [
  { fNumber: 2.5, obstruction: 0.36 },
  { fNumber: 1.8, obstruction: 0.42 },
  { fNumber: 3.6, obstruction: 0 },
  { fNumber: 5, obstruction: 0.25 },
];
const WORDS = ['hydrogen', 'oxygen+3nm', 'meadow', 'sulphur+spectrograph', 'harbour+lantern', 'beacon', 'quarry+heath', 'tarn+5nm'];
const LINES = ['Ha', 'OIII', 'SII-671', 'Hb'];

type LoadRequest = { method: string; path: string; body?: string; headers?: Record<string, string> };
type Kind = { name: string; share: number; target: number; search?: boolean; requests: (ids: number[]) => LoadRequest[] };
const pick = <T,>(xs: T[], i: number) => xs[i % xs.length];

const KINDS: Kind[] = [
  { name: 'word search', share: 10, target: 150, search: true, requests: () => WORDS.map((w) => ({ method: 'GET', path: `/api/curves?q=${w}` })) },
  {
    name: 'fitness search', share: 10, target: 150, search: true,
    requests: () => OPTICS.flatMap((o, i) => [0.5, 0.8].map((t) => ({ method: 'GET', path: `/api/curves?line=${pick(LINES, i)}&fNumber=${o.fNumber}&obstruction=${o.obstruction}&minThroughput=${t}&sort=throughput` }))),
  },
  { name: 'curve page', share: 10, target: 150, requests: (ids) => ids.slice(0, 40).map((id) => ({ method: 'GET', path: `/curves/${id}` })) },
  { name: 'points', share: 8, target: 150, requests: (ids) => ids.slice(40, 80).map((id) => ({ method: 'GET', path: `/api/curves/${id}/points` })) },
  {
    name: 'model call', share: 7, target: 50,
    requests: (ids) => ids.slice(0, 40).map((id, i) => ({
      method: 'POST', path: '/api/model/cone', headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ curveId: id, optic: pick(OPTICS, i), nEff: 2 }),
    })),
  },
  { name: 'CSV', share: 5, target: 150, requests: (ids) => ids.slice(80, 120).map((id) => ({ method: 'GET', path: `/api/curves/${id}/csv` })) },
];

const agent = new Agent({ keepAlive: true, maxSockets: Infinity });
/** What went wrong in the last round, by status or error code. */
const reasons = new Map<string, number>();
const reasonList = () => [...reasons].map(([why, n]) => `${n} × ${why}`).join(', ');

/**
 * One request through the kept-alive agent: its status, once the whole answer has arrived (10 s at
 * most). A kept-alive connection the server closed just as it was reused fails before any answer;
 * that request is sent once more on a new connection, as browsers do (Node's documentation of
 * `request.reusedSocket` gives the same advice). Nothing else is retried.
 */
function send(path: string, method: string, headers: Record<string, string>, body?: string, retried = false): Promise<number> {
  return new Promise((resolve, reject) => {
    let answered = false;
    const req = httpRequest(BASE + path, { method, headers: { ...headers, 'accept-encoding': 'gzip' }, agent, timeout: 10_000 }, (res) => {
      answered = true;
      res.on('data', () => {});
      res.on('end', () => resolve(res.statusCode ?? 0));
      res.on('error', reject);
    });
    req.on('timeout', () => req.destroy(new Error('timed out after 10 s')));
    req.on('error', (err: NodeJS.ErrnoException) => {
      const stale = req.reusedSocket && !answered && (err.code === 'ECONNRESET' || err.code === 'EPIPE');
      if (stale && !retried) send(path, method, headers, body, true).then(resolve, reject);
      else reject(err);
    });
    req.end(body);
  });
}

type Row = { kind: Kind; requests: number; rps: number; p50: number; p95: number; p99: number; errors: number; all: number[] };

/**
 * `visitors` people, each choosing a kind of request by the mix's shares, waiting for the answer,
 * then thinking for an exponentially distributed time of mean `thinkS` (so arrivals are spread
 * as real visitors' are, not sent in bursts at the top of each second).
 */
async function round(ids: number[], visitors: number, thinkS: number, seconds: number): Promise<Row[]> {
  const lists = KINDS.map((k) => k.requests(ids));
  const total = KINDS.reduce((a, k) => a + k.share, 0);
  const times = KINDS.map(() => [] as number[]);
  const errors = KINDS.map(() => 0);
  reasons.clear();
  const until = Date.now() + seconds * 1000;
  let seq = 0;
  const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
  await Promise.all(Array.from({ length: visitors }, async () => {
    await sleep(Math.random() * thinkS * 1000);
    while (Date.now() < until) {
      let pick = Math.random() * total;
      let k = 0;
      while (pick >= KINDS[k].share) pick -= KINDS[k++].share;
      const list = lists[k];
      const r = list[seq++ % list.length];
      // a peak threshold below 0.1 % changes no answer, but makes the search one the server has not kept
      const path = FRESH && KINDS[k].search ? `${r.path}&peakMin=0.${String(seq % 1_000_000).padStart(9, '0')}` : r.path;
      const t0 = performance.now();
      try {
        const status = await send(path, r.method, { accept: 'application/json,text/html', ...(r.headers ?? {}) }, r.body);
        if (status >= 400) (errors[k]++, reasons.set(`HTTP ${status}`, (reasons.get(`HTTP ${status}`) ?? 0) + 1));
      } catch (err) {
        errors[k]++;
        const why = (err as NodeJS.ErrnoException).code ?? (err as Error).message;
        reasons.set(why, (reasons.get(why) ?? 0) + 1);
      }
      times[k].push(performance.now() - t0);
      await sleep(-Math.log(1 - Math.random()) * thinkS * 1000);
    }
  }));
  return KINDS.map((kind, k) => {
    const all = times[k].sort((x, y) => x - y);
    return { kind, requests: all.length, rps: all.length / seconds, p50: percentile(all, 50), p95: percentile(all, 95), p99: percentile(all, 99), errors: errors[k], all };
  });
}

async function main() {
  const probe = await fetch(`${BASE}/api/curves?pageSize=100&sort=newest`).catch(() => null);
  if (!probe?.ok) throw new Error(`No catalogue at ${BASE}; start the server first.`);
  const first = (await probe.json()) as { total: number; items: { id: number }[] };
  const more = (await (await fetch(`${BASE}/api/curves?pageSize=100&sort=newest&page=50`)).json()) as { items: { id: number }[] };
  const ids = [...first.items, ...more.items].map((c) => c.id);
  const pids = serverPids(BASE, arg('pid', ''));
  console.log(`check:load against ${BASE}: ${first.total.toLocaleString('en-US')} verified curves; ${VISITORS} visitors, ${THINK_S} s thinking, ${SECONDS} s`);
  const searches = KINDS.filter((k) => k.search).map((k) => `${k.requests(ids).length} ${k.name}es`).join(' and ');
  console.log(
    FRESH
      ? `searches: every one new (--fresh-searches), so none is answered from a kept copy`
      : `searches: ${searches}, repeated; the server keeps a signed-out visitor's answer under the catalogue version (up to 5 min), so most repeats come from memory (--fresh-searches for none)`,
  );
  if (!pids.length) console.log('  (server process not found: pass --pid to report its memory)');

  await round(ids, VISITORS, THINK_S, 5); // warm-up: the catalogue copy, compiled routes
  const memory = memorySampler(pids);
  const rows = await round(ids, VISITORS, THINK_S, SECONDS);
  const peak = memory.stop();

  const pad = (s: string, n: number) => s.padStart(n);
  console.log(`\n${'kind'.padEnd(15)}${pad('requests', 9)}${pad('req/s', 7)}${pad('p50', 7)}${pad('p95', 7)}${pad('p99', 7)}${pad('errors', 7)}  target p95`);
  let ok = true;
  for (const r of rows) {
    const pass = r.p95 <= r.kind.target && r.errors === 0;
    ok &&= pass;
    console.log(`${r.kind.name.padEnd(15)}${pad(String(r.requests), 9)}${pad(r.rps.toFixed(1), 7)}${pad(r.p50.toFixed(0), 7)}${pad(r.p95.toFixed(0), 7)}${pad(r.p99.toFixed(0), 7)}${pad(String(r.errors), 7)}  ≤ ${r.kind.target} ms ${pass ? 'PASS' : 'FAIL'}`);
  }
  if (reasons.size) console.log(`errors: ${reasonList()}`);
  const total = rows.reduce((a, r) => a + r.rps, 0);
  console.log(`all kinds: ${total.toFixed(1)} requests a second`);
  if (pids.length) {
    const pass = peak <= TARGET_MEMORY_MB;
    ok &&= pass;
    console.log(`server memory: ${memory.start.toFixed(0)} MB at start, ${peak.toFixed(0)} MB at most  ≤ ${TARGET_MEMORY_MB} MB ${pass ? 'PASS' : 'FAIL'}`);
  }

  if (RAMP) {
    console.log(`\nraising the rate (more visitors, the same thinking) until p95 of all requests passes ${SATURATION_P95_MS} ms (15 s a step):`);
    let saturation = 0;
    for (const factor of [1, 1.5, 2, 3, 4, 6, 8, 12]) {
      const step = await round(ids, Math.round(VISITORS * factor), THINK_S, 15);
      const all = step.flatMap((r) => r.all).sort((a, b) => a - b);
      const rps = step.reduce((a, r) => a + r.rps, 0);
      const p95 = percentile(all, 95);
      const errors = step.reduce((a, r) => a + r.errors, 0);
      console.log(`  ${Math.round(VISITORS * factor)} visitors: served ${rps.toFixed(0)} req/s, p95 ${p95.toFixed(0)} ms, errors ${errors}${errors ? ` (${reasonList()})` : ''}`);
      if (p95 > SATURATION_P95_MS || errors > 0) break;
      saturation = rps;
    }
    console.log(`saturation: about ${saturation.toFixed(0)} requests a second before p95 passes ${SATURATION_P95_MS} ms`);
  }
  agent.destroy();
  console.log(ok ? '\ncheck:load: every target met' : '\ncheck:load: SOME TARGETS MISSED');
  process.exitCode = ok ? 0 : 1;
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(2);
});
