// PostgreSQL stops in the middle of uploads, reviews, searches and page views, then starts
// again. Prints what clients saw and whether anything was left half-written.
//   npm run check:faults   (scripts/check-faults.sh starts its own cluster and server first)
import { execFileSync } from 'node:child_process';
import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { closeSequelize, getSequelize } from '@/db/connection';
import { newSecret, sha256Hex } from '@/lib/auth/tokens';
import { hashPassword } from '@/lib/auth/password';
import { curveCsv, metadataFor, submissionForm } from '../tests/integration/submissions-fixtures';

const arg = (name: string, fallback?: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? process.argv[i + 1] : fallback;
};
const BASE = arg('url', 'http://127.0.0.1:3149')!;
const PGDATA = arg('pgdata')!;
const PGPORT = arg('pgport')!;
const PGBIN = process.env.PGBIN ?? '/usr/lib/postgresql/15/bin';
const DOWN_AT_S = Number(arg('down-at', '8'));
const DOWN_FOR_S = Number(arg('down-for', '8'));
const RUN_FOR_S = Number(arg('seconds', '28'));
const HANG_MS = 10_000;

type Kind = 'upload' | 'review' | 'search' | 'fitness' | 'model' | 'page';
type Outcome = { kind: Kind; at: number; ms: number; status: number; retryAfter: boolean };

const started = Date.now();
const now = () => (Date.now() - started) / 1000;
const outcomes: Outcome[] = [];
const uploaded: number[] = [];
const decided = new Map<number, string>();
let stopping = false;

function pgCtl(...args: string[]) {
  const asOwner = process.getuid?.() === 0 ? ['runuser', '-u', 'postgres', '--'] : [];
  const cmd = [...asOwner, `${PGBIN}/pg_ctl`, '-D', PGDATA, ...args];
  execFileSync(cmd[0], cmd.slice(1), { stdio: 'ignore' });
}

async function call(kind: Kind, path: string, init: RequestInit = {}): Promise<Response | null> {
  const t0 = Date.now();
  try {
    const res = await fetch(BASE + path, { ...init, signal: AbortSignal.timeout(HANG_MS), redirect: 'manual' });
    const body = await res.arrayBuffer();
    outcomes.push({ kind, at: now(), ms: Date.now() - t0, status: res.status, retryAfter: res.headers.has('retry-after') });
    return new Response(body, { status: res.status, headers: res.headers });
  } catch {
    // 0: no answer within HANG_MS, or the connection broke: a client would see a hang.
    outcomes.push({ kind, at: now(), ms: Date.now() - t0, status: 0, retryAfter: false });
    return null;
  }
}

async function makeToken(role: 'contributor' | 'moderator') {
  const email = `faults-${role}-${Date.now()}@bandcone.test`;
  const user = await db().User.create({ email, name: `Fault check ${role}`, role, passwordHash: await hashPassword('fault check password'), emailVerified: new Date() });
  const secret = newSecret('bct');
  await db().ApiToken.create({ userId: user.id, name: 'fault check', tokenHash: sha256Hex(secret), tokenPrefix: secret.slice(0, 8) });
  return { authorization: `Bearer ${secret}` };
}

async function loop(body: () => Promise<void>) {
  while (!stopping) {
    await body();
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function main() {
  const contributor = await makeToken('contributor');
  const moderator = await makeToken('moderator');
  const [someCurve] = await getSequelize().query<{ id: number }>("SELECT id FROM curves WHERE status = 'verified' ORDER BY id LIMIT 1", { type: QueryTypes.SELECT });
  await closeSequelize(); // the check's own connection must not hold the cluster up while it stops
  let seq = 0;

  const loops = [
    ...Array.from({ length: 3 }, () => loop(async () => {
      seq += 1;
      const name = `fault-${seq}.csv`;
      const res = await call('upload', '/api/submissions', {
        method: 'POST', headers: contributor,
        body: submissionForm([{ name, text: curveCsv({ noiseSeed: Date.now() % 1_000_000 + seq * 7919 }) }], metadataFor({ label: `Fault check ${seq}` })),
      });
      if (res?.status === 201) uploaded.push(((await res.json()) as { id: number }).id);
    })),
    loop(async () => {
      const id = uploaded.find((u) => !decided.has(u));
      if (id === undefined) return;
      const decision = id % 2 ? 'verify' : 'reject';
      const res = await call('review', `/api/submissions/${id}/review`, {
        method: 'POST', headers: { ...moderator, 'content-type': 'application/json' }, body: JSON.stringify({ decision, note: 'fault check' }),
      });
      if (res?.status === 200) decided.set(id, decision === 'verify' ? 'verified' : 'rejected');
    }),
    ...Array.from({ length: 2 }, () => loop(async () => { await call('search', '/api/curves?q=hydrogen&pageSize=20'); })),
    loop(async () => { await call('fitness', '/api/curves?line=Ha&fNumber=2.5&obstruction=0.36&minThroughput=0.5'); }),
    loop(async () => {
      await call('model', '/api/model/cone', {
        method: 'POST', headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ curveId: someCurve.id, optic: { fNumber: 2.5, obstruction: 0.36 }, nEff: 2 }),
      });
    }),
    ...Array.from({ length: 2 }, (_, k) => loop(async () => { await call('page', k ? `/curves/${someCurve.id}` : '/curves'); })),
  ];

  let downAt = 0;
  let upAt = 0;
  await new Promise((r) => setTimeout(r, DOWN_AT_S * 1000));
  pgCtl('-m', 'fast', 'stop');
  downAt = now();
  console.log(`PostgreSQL stopped at ${downAt.toFixed(1)} s`);
  await new Promise((r) => setTimeout(r, DOWN_FOR_S * 1000));
  pgCtl('-w', '-t', '60', '-l', `${PGDATA}/server.log`, '-o', `-p ${PGPORT} -c listen_addresses=127.0.0.1 -k ${PGDATA}`, 'start');
  upAt = now();
  console.log(`PostgreSQL started again at ${upAt.toFixed(1)} s`);
  await new Promise((r) => setTimeout(r, Math.max(0, RUN_FOR_S - upAt) * 1000));
  stopping = true;
  await Promise.all(loops);

  // Recovery: from the restart to the first answer of every database-backed kind that succeeds.
  const recoveredAt = (['search', 'upload', 'page'] as Kind[]).map((k) => outcomes.find((o) => o.kind === k && o.at > upAt && o.status >= 200 && o.status < 400)?.at ?? Infinity);
  const recover = Math.max(...recoveredAt) - upAt;

  const sequelize = getSequelize();
  const checks: Record<string, string> = {
    'submissions without files': `SELECT count(*) FROM submissions s WHERE NOT EXISTS (SELECT 1 FROM submission_files f WHERE f.submission_id = s.id)`,
    'submissions without curves': `SELECT count(*) FROM submissions s WHERE NOT EXISTS (SELECT 1 FROM curves c WHERE c.submission_id = s.id)`,
    'files without a curve': `SELECT count(*) FROM submission_files f WHERE NOT EXISTS (SELECT 1 FROM curves c WHERE c.file_id = f.id)`,
    'submissions without their creation audit row': `SELECT count(*) FROM submissions s WHERE NOT EXISTS (SELECT 1 FROM audit_events a WHERE a.target_type = 'submission' AND a.target_id = s.id::text AND a.action = 'submission.created')`,
    'decisions without a review or audit row': `SELECT count(*) FROM submissions s WHERE s.status IN ('verified', 'rejected', 'changes_requested') AND s.decided_at IS NOT NULL AND (
        NOT EXISTS (SELECT 1 FROM reviews r WHERE r.submission_id = s.id AND r.kind IN ('verify', 'reject', 'request_changes'))
        OR NOT EXISTS (SELECT 1 FROM audit_events a WHERE a.target_type = 'submission' AND a.target_id = s.id::text AND a.action LIKE 'submission.%' AND a.action NOT IN ('submission.created', 'submission.note', 'submission.revised')))`,
    'curves whose status differs from their submission': `SELECT count(*) FROM curves c JOIN submissions s ON s.id = c.submission_id WHERE c.revision = s.revision AND c.status <> s.status AND c.status <> 'superseded'`,
    'verified curves missing from fitness search': `SELECT count(*) FROM curves c WHERE c.status = 'verified' AND NOT EXISTS (SELECT 1 FROM curve_fitness f WHERE f.curve_id = c.id)`,
  };
  const inconsistent: Record<string, number> = {};
  for (const [name, sql] of Object.entries(checks)) {
    const [row] = await sequelize.query<{ count: string }>(sql, { type: QueryTypes.SELECT });
    inconsistent[name] = Number(row.count);
  }
  // Nothing a client was told is saved may be missing.
  const acceptedMissing = uploaded.length
    ? Number((await sequelize.query<{ n: string }>('SELECT count(*) AS n FROM unnest(ARRAY[:ids]::int[]) i WHERE NOT EXISTS (SELECT 1 FROM submissions s WHERE s.id = i)', { replacements: { ids: uploaded }, type: QueryTypes.SELECT }))[0].n)
    : 0;
  let decisionsLost = 0;
  for (const [id, status] of decided) {
    const [row] = await sequelize.query<{ status: string }>('SELECT status FROM submissions WHERE id = :id', { replacements: { id }, type: QueryTypes.SELECT });
    if (row?.status !== status) decisionsLost += 1;
  }
  await closeSequelize();

  const during = outcomes.filter((o) => o.at >= downAt && o.at <= upAt);
  const by = (f: (o: Outcome) => boolean) => outcomes.filter(f).length;
  const other5xx = by((o) => o.status >= 500 && o.status !== 503);
  const hangs = by((o) => o.status === 0);
  const no503Retry = by((o) => o.status === 503 && !o.retryAfter);
  const rows = Object.values(inconsistent).reduce((a, b) => a + b, 0) + acceptedMissing + decisionsLost;
  const kinds = [...new Set(outcomes.map((o) => o.kind))];
  console.log('\nfault check: PostgreSQL stopped for %d s under uploads, reviews, searches and pages', DOWN_FOR_S);
  console.log(`  requests sent              ${outcomes.length} (${during.length} while it was down)`);
  console.log(`  503 answers                ${by((o) => o.status === 503)} (${no503Retry} without Retry-After)`);
  console.log(`  5xx other than 503         ${other5xx}   (must be 0)`);
  console.log(`  no answer in ${HANG_MS / 1000} s / broken  ${hangs}   (must be 0)`);
  console.log(`  slowest answer while down  ${Math.max(0, ...during.map((o) => o.ms))} ms`);
  for (const k of kinds) {
    const d = during.filter((o) => o.kind === k);
    const statuses = [...new Set(d.map((o) => o.status))].sort().join(', ');
    console.log(`    ${k.padEnd(8)} while down: ${d.length} requests, statuses ${statuses || '-'}`);
  }
  console.log(`  uploads stored / decisions ${uploaded.length} / ${decided.size}`);
  console.log(`  rows inconsistent          ${rows}   (must be 0)`, rows ? inconsistent : '');
  console.log(`  accepted but missing       ${acceptedMissing + decisionsLost}   (must be 0)`);
  console.log(`  seconds to recover         ${Number.isFinite(recover) ? recover.toFixed(1) : 'never'} (after PostgreSQL was back; no app restart)`);
  const ok = other5xx === 0 && hangs === 0 && rows === 0 && no503Retry === 0 && Number.isFinite(recover);
  console.log(ok ? 'fault check: every target met' : 'fault check: TARGET MISSED');
  process.exit(ok ? 0 : 1);
}

main().catch((err) => {
  console.error(err);
  process.exit(2);
});
