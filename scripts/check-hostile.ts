// npm run check:hostile -- <url> [--pid N] [--email E --password P] [--concurrency 1] [--seed 1]
//
// Sends a generated corpus of hostile files and bodies (long fields, many columns, NUL bytes,
// UTF-16/32 and BOMs, quotes, formulas, huge numbers, deep JSON…) to the routes a stranger or
// a contributor can reach with data: POST /api/curves/preview (file and JSON), POST
// /api/submissions, POST /api/model/cone and /api/model/neff. Prints how many were sent, the
// answers by status, the 5xx (target: none), the 429s (counted apart: a limit doing its job;
// raise PREVIEW_RATE_PER_MINUTE on the server for a clean run), the slowest answer (target
// ≤ 1 s) and the server's memory growth, read from /proc/<pid>/status (the pid is found from
// the URL's port when the server runs on this machine, or given with --pid).
// The exit status is 1 when a target is missed.
import { pidListeningOn, rssBytes } from './lib/proc';
import { mulberry32 } from '../seeds/world/prng';
import { signIn } from './lib/sign-in';

type Args = { url: string; pid: number | null; email: string; password: string; concurrency: number; seed: number };

function parseArgs(argv: string[]): Args {
  const get = (name: string) => {
    const i = argv.indexOf(name);
    return i >= 0 ? argv[i + 1] : undefined;
  };
  const url = argv.find((a, i) => !a.startsWith('--') && !(i > 0 && argv[i - 1].startsWith('--'))) ?? process.env.BANDCONE_URL ?? 'http://127.0.0.1:3000';
  const port = Number(new URL(url).port || 80);
  const pid = get('--pid') ? Number(get('--pid')) : pidListeningOn(port);
  return {
    url: url.replace(/\/$/, ''),
    pid,
    email: get('--email') ?? 'contributor@bandcone.test',
    password: get('--password') ?? process.env.DEMO_PASSWORD ?? 'bandcone-demo',
    concurrency: Math.max(1, Number(get('--concurrency') ?? 1)),
    seed: Number(get('--seed') ?? 1),
  };
}

// ---------------------------------------------------------------- the corpus

/** A small deterministic generator (the demo world's mulberry32), so a run can be repeated exactly. */
const rng = mulberry32;

type FileCase = { kind: string; bytes: Uint8Array };
type JsonCase = { kind: string; body: string };

const enc = new TextEncoder();
const utf8 = (s: string) => enc.encode(s);

function utf16(s: string, bigEndian: boolean, bom = true): Uint8Array {
  const out = new Uint8Array((s.length + (bom ? 1 : 0)) * 2);
  let at = 0;
  const put = (c: number) => {
    out[at++] = bigEndian ? c >> 8 : c & 0xff;
    out[at++] = bigEndian ? c & 0xff : c >> 8;
  };
  if (bom) put(0xfeff);
  for (let i = 0; i < s.length; i++) put(s.charCodeAt(i));
  return out;
}

function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

/** A plausible curve (invented passband) the hostile files disguise or break. */
function plainRows(rand: () => number, n: number, sep = ',', dec = '.'): string[] {
  const rows: string[] = [];
  const start = 600 + Math.floor(rand() * 100);
  for (let i = 0; i < n; i++) {
    const wl = (start + i * 0.5).toFixed(2);
    const t = (0.9 / (1 + ((i - n / 2) / (n / 8)) ** 6)).toFixed(5);
    rows.push(`${wl.replace('.', dec)}${sep}${t.replace('.', dec)}`);
  }
  return rows;
}

function digits(rand: () => number, n: number): string {
  let s = '';
  while (s.length < n) s += Math.floor(rand() * 1e15).toString().padStart(15, '7');
  return s.slice(0, n);
}

function fileCases(rand: () => number, n: number): FileCase[] {
  const out: FileCase[] = [];
  const pick = <T,>(xs: T[]) => xs[Math.floor(rand() * xs.length)];
  const sizes = [1_000, 10_000, 40_000, 160_000];
  const generators: { kind: string; make: () => Uint8Array }[] = [
    { kind: 'long digit run', make: () => utf8(`${digits(rand, pick(sizes))}\n${plainRows(rand, 6).join('\n')}\n`) },
    { kind: 'long decimal-comma run', make: () => utf8(`${Array.from({ length: pick([100, 2000, 20000]) }, () => '1,2').join(';')}\n${plainRows(rand, 8, ';', ',').join('\n')}\n`) },
    { kind: 'long digit run with dots', make: () => utf8(`${'1.'.repeat(pick([500, 5000, 40000]))}1,0.5\n${plainRows(rand, 8).join('\n')}\n`) },
    { kind: 'many columns', make: () => utf8(Array.from({ length: 26 }, (_, r) => Array.from({ length: pick([65, 500, 5000, 20000]) }, (_, c) => ((r + c) % 97) / 10).join(',')).join('\n')) },
    { kind: 'NUL bytes', make: () => { const b = utf8(plainRows(rand, 50).join('\n')); for (let i = 0; i < b.length; i += 1 + Math.floor(rand() * 40)) b[i] = 0; return b; } },
    { kind: 'UTF-16 LE with BOM', make: () => utf16(`wavelength,T\n${plainRows(rand, 80).join('\n')}\n`, false) },
    { kind: 'UTF-16 BE with BOM', make: () => utf16(`wavelength;T\n${plainRows(rand, 80, ';', ',').join('\n')}\n`, true) },
    { kind: 'UTF-16 LE without BOM', make: () => utf16(plainRows(rand, 80).join('\r\n'), false, false) },
    { kind: 'UTF-8 BOM', make: () => concat(new Uint8Array([0xef, 0xbb, 0xbf]), utf8(`nm,%T\n${plainRows(rand, 80).join('\n')}`)) },
    { kind: 'UTF-32 BOM', make: () => concat(new Uint8Array([0xff, 0xfe, 0, 0]), utf8(plainRows(rand, 40).join('\n'))) },
    { kind: 'many BOMs', make: () => utf8('\ufeff'.repeat(pick([1, 100, 10000])) + plainRows(rand, 40).join('\n')) },
    { kind: 'quotes', make: () => utf8(plainRows(rand, 60).map((r) => pick([`"${r}"`, `"${r.replace(',', '","')}"`, `"""${r}`, `${r}"`, `"${'"'.repeat(pick([1, 99, 9999]))}`])).join('\n')) },
    { kind: 'open quote to the end', make: () => utf8(`"wavelength,T\n${plainRows(rand, pick([100, 5000])).join('\n')}`) },
    { kind: 'formulas', make: () => utf8(`=HYPERLINK("http://x","y"),+1\n${plainRows(rand, 40).map((r, i) => (i % 3 ? r : `=${r.replace(',', ',@SUM(')}`)).join('\n')}\n-2+3,=1+1\n@cmd,|calc`) },
    { kind: 'huge numbers', make: () => utf8(plainRows(rand, 40).concat([`1e308,0.5`, `1e309,0.5`, `-1e400,1`, `${'9'.repeat(pick([64, 65, 400, 4000]))},0.5`, `650,1e-400`, `0x1F,0.5`, `Infinity,NaN`, `650,${'1'.repeat(5000)}e-5000`]).join('\n')) },
    { kind: 'exponent runs', make: () => utf8(`${'1e'.repeat(pick([10, 1000, 30000]))}5,0.5\n${plainRows(rand, 20).join('\n')}`) },
    { kind: 'separator storm', make: () => utf8(plainRows(rand, 60).map((r) => r.replace(',', pick([';;;;;;;;', '\t\t\t', ' , ; \t', ','.repeat(1000)]))).join('\n')) },
    { kind: 'line-ending mix', make: () => utf8(plainRows(rand, 200).map((r, i) => r + ['\r', '\n', '\r\n', '\n\r'][i % 4]).join('')) },
    { kind: 'one long line', make: () => utf8('a'.repeat(pick([1_000, 100_000, 1_000_000]))) },
    { kind: 'whitespace only', make: () => utf8(' \t\r\n'.repeat(pick([0, 10, 100_000]))) },
    { kind: 'random bytes', make: () => Uint8Array.from({ length: pick([10, 1000, 50_000]) }, () => Math.floor(rand() * 256)) },
    { kind: 'many rows', make: () => utf8(plainRows(rand, pick([30_000, 210_000])).join('\n')) },
    { kind: 'header storm', make: () => utf8(`${Array.from({ length: pick([10, 2000]) }, (_, i) => `# note ${i}: ${'x'.repeat(200)}`).join('\n')}\n${plainRows(rand, 40).join('\n')}`) },
    { kind: 'JCAMP-like', make: () => utf8(`##TITLE=${'t'.repeat(pick([10, 100_000]))}\n##JCAMP-DX=4.24\n##XYDATA=(X++(Y..Y))\n${plainRows(rand, 40).join('\n')}\n##END=`) },
    { kind: 'unicode digits and minus', make: () => utf8(plainRows(rand, 60).map((r) => r.replace(/\d/g, (d) => pick([d, String.fromCharCode(0x0660 + Number(d)), String.fromCharCode(0xff10 + Number(d))])).replace('0.', '−0.')).join('\n')) },
    { kind: 'lone surrogates and escapes', make: () => utf8(`wl,T\n${plainRows(rand, 30).join('\n')}\n\ud800,\udfff\n\u202e650,0.5\n`) },
  ];
  for (let i = 0; i < n; i++) {
    const g = generators[i % generators.length];
    out.push({ kind: g.kind, bytes: g.make() });
  }
  // A few big ones at the 5 MB file cap: the shapes the linear-time reader must take.
  out.push({ kind: 'digit run, 5 MB', bytes: utf8(digits(rand, 5 * 1024 * 1024 - 200) + '\n650,0.5\n651,0.6\n') });
  out.push({ kind: 'many columns, 5 MB', bytes: utf8(Array.from({ length: 130 }, () => Array.from({ length: 20000 }, () => '1').join(',')).join('\n').slice(0, 5 * 1024 * 1024 - 10)) });
  out.push({ kind: 'over the cap, 5 MB + 1', bytes: new Uint8Array(5 * 1024 * 1024 + 1).fill(0x31) });
  return out;
}

function deep(depth: number, open: string, close: string, inner = '0'): string {
  return open.repeat(depth) + inner + close.repeat(depth);
}

function jsonCases(rand: () => number, n: number): { route: string; body: string; kind: string }[] {
  const pick = <T,>(xs: T[]) => xs[Math.floor(rand() * xs.length)];
  const pts = (k: number, f: (i: number) => unknown = (i) => (i > k / 3 && i < (2 * k) / 3 ? 0.9 : 0.01)) => ({ wavelengthNm: Array.from({ length: k }, (_, i) => 600 + i * 0.5), transmission: Array.from({ length: k }, (_, i) => f(i)) });
  const optic = { fNumber: 2, obstruction: 0.3 };
  const makers: { kind: string; route: string; make: () => string }[] = [
    { kind: 'deep arrays', route: pick(['/api/model/cone', '/api/curves/preview', '/api/model/neff']), make: () => deep(pick([100, 10_000, 500_000]), '[', ']') },
    { kind: 'deep objects', route: '/api/model/cone', make: () => deep(pick([100, 10_000, 200_000]), '{"a":', '}') },
    { kind: 'deep points', route: '/api/curves/preview', make: () => `{"points":${deep(pick([1000, 100_000]), '{"wavelengthNm":', '}', '[]')}}` },
    { kind: 'deep metadata', route: '/api/curves/preview', make: () => JSON.stringify({ points: pts(40) }).slice(0, -1) + `,"metadata":${deep(pick([1000, 100_000]), '{"label":', '}', '"x"')}}` },
    { kind: 'huge numbers', route: '/api/model/cone', make: () => JSON.stringify({ points: pts(40), optic, nEff: 2, lines: ['Ha'] }).replace('"nEff":2', `"nEff":${pick(['1e308', '1e999', '-1e999', '9'.repeat(5000), '1e-999'])}`) },
    { kind: 'huge numbers in points', route: pick(['/api/model/cone', '/api/curves/preview']), make: () => `{"points":{"wavelengthNm":[${Array.from({ length: 40 }, (_, i) => (i % 7 ? 600 + i : pick(['1e308', '1e999', '-0', '9'.repeat(400)]))).join(',')}],"transmission":[${Array.from({ length: 40 }, () => pick(['0.5', '1e999', '-1e999', '1e-400'])).join(',')}]},"optic":{"fNumber":2,"obstruction":0.3},"nEff":2}` },
    { kind: 'strings for numbers', route: '/api/model/cone', make: () => JSON.stringify({ points: pts(40, () => pick(['NaN', 'Infinity', '=1+1', '0x10', ''])), optic, nEff: '2' }) },
    { kind: 'mismatched lengths', route: pick(['/api/model/cone', '/api/curves/preview']), make: () => JSON.stringify({ points: { wavelengthNm: [1, 2, 3, 4, 5, 6], transmission: [0.5] }, optic, nEff: 2 }) },
    { kind: 'points at and over the cap', route: pick(['/api/model/cone', '/api/curves/preview']), make: () => JSON.stringify({ points: pts(pick([200_000, 200_001])), optic, nEff: 2, lines: ['Ha'] }) },
    { kind: 'long strings', route: pick(['/api/model/cone', '/api/model/neff', '/api/curves/preview']), make: () => JSON.stringify({ points: pts(40), optic, nEff: 2, lines: ['x'.repeat(pick([1000, 1_000_000]))], metadata: { label: '='.repeat(100_000) } }) },
    { kind: 'many keys', route: pick(['/api/model/cone', '/api/model/neff']), make: () => `{${Array.from({ length: pick([1000, 100_000]) }, (_, i) => `"k${i}":${i}`).join(',')}}` },
    { kind: 'prototype keys', route: pick(['/api/model/cone', '/api/curves/preview', '/api/model/neff']), make: () => `{"__proto__":{"polluted":true},"constructor":{"prototype":{"x":1}},"points":${JSON.stringify(pts(40))},"optic":{"fNumber":2,"obstruction":0.3,"__proto__":{"fNumber":1}},"nEff":2}` },
    { kind: 'NUL and escapes', route: pick(['/api/model/cone', '/api/curves/preview']), make: () => `{"points":${JSON.stringify(pts(40))},"optic":{"fNumber":2,"obstruction":0.3},"nEff":2,"lines":["\\u0000","\\ud800","H\\u0000a"],"metadata":{"label":"\\u0000\\u202e=cmd"}}` },
    { kind: 'not JSON', route: pick(['/api/model/cone', '/api/curves/preview', '/api/model/neff']), make: () => pick(['', '{', 'nul', '\u0000', '{"a":1}{"b":2}', '[1,2,', 'ÿþ{}', '\ufeff{}', "{'a':1}", 'NaN']) },
    { kind: 'UTF-16 JSON', route: '/api/model/neff', make: () => Buffer.from(utf16('{"measurements":[{"aoiDeg":0,"cwlNm":656},{"aoiDeg":10,"cwlNm":654}]}', false)).toString('latin1') },
    { kind: 'neff extremes', route: '/api/model/neff', make: () => JSON.stringify({ measurements: Array.from({ length: pick([2, 200, 201, 10_000]) }, (_, i) => ({ aoiDeg: pick([0, 60, 60.0001, -0, i % 61]), cwlNm: pick([656, 1e-300, 1e308, 656 + i * 1e-12]) })) }) },
    { kind: 'neff same angles', route: '/api/model/neff', make: () => JSON.stringify({ measurements: [{ aoiDeg: 10, cwlNm: 656 }, { aoiDeg: 10, cwlNm: 650 }] }) },
    { kind: 'neff curve ids', route: '/api/model/neff', make: () => JSON.stringify({ curveIds: pick([[1, 1], [2147483648, 1], [1, 2, 3, 999999999], Array.from({ length: 50 }, (_, i) => i + 1)]) }) },
    { kind: 'cone optic extremes', route: '/api/model/cone', make: () => JSON.stringify({ points: pts(pick([5, 400])), optic: { fNumber: pick([0.5, 40, 0.4999]), obstruction: pick([0, 0.99, 1, -0.1]), fieldAngleDeg: pick([0, 30, 31]) }, nEff: pick([1, 4, 1.0000001]), measuredAoiDeg: pick([0, 60]), preShiftNm: pick([-50, 50]), radialVelocityKms: pick([-30000, 30000]), lines: ['Ha', 'OIII', 'SII'], includeCurve: true }) },
    { kind: 'cone curve ids', route: '/api/model/cone', make: () => JSON.stringify({ curveId: pick([1, 0, -1, 2147483648, 1e308, 1.5]), optic, nEff: 2 }) },
  ];
  const out: { route: string; body: string; kind: string }[] = [];
  for (let i = 0; i < n; i++) {
    const m = makers[i % makers.length];
    out.push({ kind: m.kind, route: m.route, body: m.make() });
  }
  return out;
}

function hostileMetadata(rand: () => number): string {
  const pick = <T,>(xs: T[]) => xs[Math.floor(rand() * xs.length)];
  const base = {
    label: pick(['Hostile test 3 nm', '=HYPERLINK("http://x","y")', 'x,=1+1', '\u0000'.repeat(10), 'L'.repeat(100_000)]),
    maker: pick(['Check Optics (invented)', '@SUM(A1)', '"'.repeat(1000)]),
    lines: pick([['Ha'], ['Ha', 'Ha'], Array.from({ length: 1000 }, () => 'Ha')]),
    nominalCwlNm: pick([656.3, 1e308, -1]),
    nominalFwhmNm: pick([3, 0, 1e-300]),
    licence: pick(['CC-BY-4.0', 'CC0-1.0', '=cmd']),
    method: { instrument: 'spectrophotometer', resolutionNm: 0.05, beam: 'collimated', aoiDeg: pick([0, 60, 90]), temperatureC: 20, polarization: 'unpolarized', measuredOn: pick(['2026-01-15', '9999-99-99', '']), lab: 'Check bench' },
  };
  return pick([JSON.stringify(base), deep(pick([100, 100_000]), '[', ']'), '{', '\u0000']);
}

// ---------------------------------------------------------------- sending

type Shot = { route: string; kind: string; status: number; ms: number; note?: string };

async function main() {
  const args = parseArgs(process.argv.slice(2));
  const rand = rng(args.seed);
  const origin = new URL(args.url).origin;
  const files = fileCases(rand, 1100);
  const bodies = jsonCases(rand, 1000);
  // After the corpus is built: a connection idle past the server's keep-alive timeout while
  // it was being generated would be closed under the first request.
  const cookie = await signIn(args.url, args.email, args.password).catch(() => null);
  if (!cookie) console.log(`(could not sign in as ${args.email}: the submission route is sent to signed out, so it answers 401)`);
  type Job = { route: string; kind: string; init: () => RequestInit };
  const jobs: Job[] = [];
  files.forEach((f, i) => {
    const blob = () => new Blob([f.bytes as BlobPart], { type: 'text/csv' });
    jobs.push({
      route: '/api/curves/preview',
      kind: `file: ${f.kind}`,
      init: () => {
        const form = new FormData();
        form.append('file', blob(), `hostile-${i}.csv`);
        if (i % 5 === 0) form.append('options', JSON.stringify({ wavelengthColumn: i % 200, delimiter: ';' }));
        if (i % 7 === 0) form.append('metadata', hostileMetadata(rand));
        return { method: 'POST', body: form };
      },
    });
    // Every third file also goes through the submission route, with plausible or hostile metadata.
    if (i % 3 === 0) {
      const meta = i % 2 === 0 ? hostileMetadata(rand) : JSON.stringify({ label: `Hostile file ${i}`, maker: 'Check Optics (invented)', lines: ['Ha'], nominalCwlNm: 656.3, nominalFwhmNm: 3, licence: 'CC-BY-4.0', method: { instrument: 'spectrophotometer', resolutionNm: 0.05, beam: 'collimated', aoiDeg: 0, temperatureC: 20, polarization: 'unpolarized', measuredOn: '2026-01-15', lab: 'Check bench' } });
      jobs.push({
        route: '/api/submissions',
        kind: `file: ${f.kind}`,
        init: () => {
          const form = new FormData();
          form.append('metadata', meta);
          form.append('file', blob(), `hostile-${i}.csv`);
          return { method: 'POST', body: form, headers: cookie ? { cookie, origin } : undefined };
        },
      });
    }
  });
  for (const b of bodies) jobs.push({ route: b.route, kind: `json: ${b.kind}`, init: () => ({ method: 'POST', body: b.body, headers: { 'content-type': 'application/json' } }) });
  // Interleave routes so a slow answer shows as slow rather than as queueing behind its kind.
  for (let i = jobs.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [jobs[i], jobs[j]] = [jobs[j], jobs[i]];
  }

  const rssStart = args.pid ? rssBytes(args.pid) : null;
  let rssPeak = rssStart ?? 0;
  const sampler = setInterval(() => {
    const r = args.pid ? rssBytes(args.pid) : null;
    if (r && r > rssPeak) rssPeak = r;
  }, 100);

  const shots: Shot[] = [];
  let next = 0;
  const started = Date.now();
  async function worker() {
    while (next < jobs.length) {
      const job = jobs[next++];
      const t0 = performance.now();
      const init = job.init();
      const size = typeof init.body === 'string' ? init.body.length : init.body instanceof FormData ? -1 : 0;
      try {
        const res = await fetch(args.url + job.route, { ...init, redirect: 'manual' });
        const text = await res.text();
        const shot: Shot = { route: job.route, kind: job.kind, status: res.status, ms: performance.now() - t0 };
        if (res.status >= 500) shot.note = text.slice(0, 200);
        shots.push(shot);
      } catch (err) {
        shots.push({ route: job.route, kind: job.kind, status: 0, ms: performance.now() - t0, note: `${String((err as Error).cause ?? err)} (job ${next - 1}${size > 0 ? `, ${size} characters` : ''})` });
      }
      if (shots.length % 250 === 0) process.stdout.write(`  ${shots.length}/${jobs.length} sent\n`);
    }
  }
  await Promise.all(Array.from({ length: args.concurrency }, worker));
  clearInterval(sampler);
  const rssEnd = args.pid ? rssBytes(args.pid) : null;

  const byStatus = new Map<number, number>();
  for (const s of shots) byStatus.set(s.status, (byStatus.get(s.status) ?? 0) + 1);
  const fives = shots.filter((s) => s.status >= 500 || s.status === 0);
  const limited = shots.filter((s) => s.status === 429);
  const answered = shots.filter((s) => s.status !== 429);
  const slowest = [...answered].sort((a, b) => b.ms - a.ms).slice(0, 5);
  const mb = (b: number) => `${(b / 1048576).toFixed(0)} MB`;
  const routes = [...new Set(shots.map((s) => s.route))];

  console.log(`\nhostile corpus against ${args.url} (seed ${args.seed}, concurrency ${args.concurrency}, ${((Date.now() - started) / 1000).toFixed(0)} s)`);
  console.log(`  requests     ${shots.length}  (${files.length} files, ${bodies.length} JSON bodies; ${routes.map((r) => `${r} ${shots.filter((s) => s.route === r).length}`).join(', ')})`);
  console.log(`  by status    ${[...byStatus].sort((a, b) => a[0] - b[0]).map(([k, v]) => `${k || 'no answer'}: ${v}`).join(', ')}`);
  console.log(`  5xx          ${fives.length}  (target 0)`);
  for (const f of fives.slice(0, 10)) console.log(`                ${f.status || 'no answer'} ${f.route} ${f.kind} ${f.note ?? ''}`);
  console.log(`  429          ${limited.length}  (rate limits; not counted as answers below)`);
  console.log(`  slowest      ${slowest[0] ? `${slowest[0].ms.toFixed(0)} ms  ${slowest[0].route}  ${slowest[0].kind}  → ${slowest[0].status}` : '–'}  (target ≤ 1000 ms)`);
  for (const s of slowest.slice(1)) console.log(`               ${s.ms.toFixed(0)} ms  ${s.route}  ${s.kind}  → ${s.status}`);
  if (args.pid && rssStart && rssEnd) {
    console.log(`  server RSS   ${mb(rssStart)} before, ${mb(rssPeak)} at peak, ${mb(rssEnd)} after: growth ${mb(rssEnd - rssStart)} (peak +${mb(rssPeak - rssStart)})  [pid ${args.pid}]`);
  } else {
    console.log('  server RSS   not measured (give --pid, or run the server on this machine)');
  }
  const ok = fives.length === 0 && (slowest[0]?.ms ?? 0) <= 1000 && shots.length >= 2000;
  console.log(ok ? '\n  every target met' : '\n  TARGET MISSED');
  process.exit(ok ? 0 : 1);
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(2);
});
