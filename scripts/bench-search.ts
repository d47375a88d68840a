// Fires a fixed mix of catalogue searches (text, parametric, fitness) at a running server
// through HTTP and prints p50/p95 latency, throughput and the server's memory against the
// targets: p95 ≤ 80 ms for each kind, server RSS ≤ 500 MB.
//   npm run bench:search -- [--url http://127.0.0.1:3000] [--duration 20] [--connections 4] [--pid <server pid>] [--cold] [--kinds text,fitness] [--churn 2]
// --churn S verifies a curve every S seconds while it runs (a copy of a verified curve and its grid rows,
// committed in one transaction through DATABASE_URL, the scale database's owner), as a busy library would.
// The public catalogue's totals and facet counts are kept for 30 s per distinct search (paging and
// re-sorting ask for them again); --cold makes every request a distinct search, so none is reused.
// Point the server at the scale database first (npm run seed:scale, then DATABASE_URL=… next start).
import pg from 'pg';
import { autocannon, percentile, rssMb, serverPids as pidsServing } from './bench-support';

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

const serverPids = () => pidsServing(BASE, arg('pid', ''));

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

/** Every `seconds`, one transaction adds a verified curve (a copy of an existing one, with its grid rows). */
function churn(seconds: number) {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('--churn needs DATABASE_URL: the owner URL of the database the server reads');
  const client = new pg.Client({ connectionString: url });
  const made: number[] = [];
  let timer: NodeJS.Timeout | undefined;
  let pending: Promise<void> = Promise.resolve();
  const once = async () => {
    await client.query('BEGIN');
    const { rows } = await client.query<{ id: number; src: number }>(
      `WITH src AS (SELECT id FROM curves WHERE status = 'verified' ORDER BY random() LIMIT 1)
       INSERT INTO curves (contributor_id, status, label, maker, lines, serial, notes, licence, method, instrument, aoi_deg,
                           wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
                           blocking_od, line_transmission, n_eff, verified_at)
       SELECT contributor_id, 'verified', label || ' (bench churn)', maker, lines, serial, notes, licence, method, instrument, aoi_deg,
              wavelength_nm, transmission, point_count, points_hash, peak_t, cwl_nm, fwhm_nm, mean_in_band_t, effective_bandwidth_nm,
              blocking_od, line_transmission, n_eff, now()
       FROM curves WHERE id = (SELECT id FROM src) RETURNING id, (SELECT id FROM src) AS src`,
    );
    const { id, src } = rows[0];
    await client.query(`INSERT INTO curve_fitness (curve_id, line_id, level, primary_line, n_eff_default, direct, canonical)
      SELECT $2, line_id, level, primary_line, n_eff_default, direct, canonical FROM curve_fitness WHERE curve_id = $1`, [src, id]);
    await client.query(`INSERT INTO curve_fitness_fine (curve_id, line_id, fine) SELECT $2, line_id, fine FROM curve_fitness_fine WHERE curve_id = $1`, [src, id]);
    await client.query('COMMIT');
    made.push(id);
  };
  return {
    async start() {
      await client.connect();
      timer = setInterval(() => {
        // one at a time on the one client, so no two transactions interleave
        pending = pending.then(once).catch((err) => console.error('churn:', err.message));
      }, seconds * 1000);
    },
    async stop() {
      clearInterval(timer);
      await pending;
      // A verified curve is never deleted (db/migrations/0005); the owner lifts the guard for the bench's own rows.
      if (made.length) {
        await client.query('BEGIN');
        await client.query(`SET LOCAL bandcone.maintenance = 'on'`);
        await client.query('DELETE FROM curves WHERE id = ANY($1::int[])', [made]);
        await client.query('COMMIT');
      }
      await client.end();
      return made.length;
    },
  };
}

async function main() {
  const churnEvery = Number(arg('churn', '0'));
  const churner = churnEvery > 0 ? churn(churnEvery) : null;
  const probe = await fetch(`${BASE}/api/curves?pageSize=1`).catch(() => null);
  if (!probe?.ok) throw new Error(`No catalogue at ${BASE} (GET /api/curves answered ${probe?.status ?? 'nothing'}); start the server first.`);
  const { total } = (await probe.json()) as { total: number };
  const pids = serverPids();
  console.log(`bench:search against ${BASE}: ${total.toLocaleString('en-US')} verified curves, ${CONNECTIONS} connections, ${DURATION} s per kind (after ${WARMUP} s warm-up)${COLD ? ', every search distinct (no reused counts)' : ''}`);
  if (pids.length === 0) console.log('  (server process not found: pass --pid to report its memory)');

  await churner?.start();
  let peak = rssMb(pids);
  const sampler = setInterval(() => (peak = Math.max(peak, rssMb(pids))), 250);
  const rows = [];
  for (const [kind, paths] of Object.entries(KINDS)) {
    if (ONLY.length > 0 && !ONLY.includes(kind)) continue;
    await run(kind, paths, WARMUP);
    rows.push(await run(kind, paths, DURATION));
  }
  clearInterval(sampler);
  if (churner) console.log(`\nwhile ${await churner.stop()} curves were verified, one every ${churnEvery} s`);
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
