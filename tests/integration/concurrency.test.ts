import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { db } from '@/db/models';
import { newSecret, sha256Hex } from '@/lib/auth/tokens';
import { curveCsv, metadataFor, singleCurve, submissionForm, type Upload } from './submissions-fixtures';
import { pool } from '@/scripts/lib/pool';
import { createRng } from '@/seeds/world/prng';

// Many people at once on the same rows. What must hold whatever the interleaving:
// every submission is decided exactly once, and every upload is stored whole or refused whole.
afterAll(() => closeSequelize());

async function tokenClient(role: 'contributor' | 'moderator') {
  const user = await makeUser(role);
  const secret = newSecret('bct');
  await db().ApiToken.create({ userId: user.id, name: 'concurrency test', tokenHash: sha256Hex(secret), tokenPrefix: secret.slice(0, 8) });
  const base = anonymous();
  const client: Client = {
    cookie: '',
    fetch: (path, init = {}) => base.fetch(path, { ...init, headers: { ...Object.fromEntries(new Headers(init.headers)), authorization: `Bearer ${secret}` } }),
  };
  return { ...user, client };
}

/** A seeded Fisher–Yates shuffle (the demo world's generator), so each moderator decides in an order of their own. */
function shuffled<T>(items: T[], seed: number): T[] {
  const a = [...items];
  const rng = createRng(seed);
  for (let i = a.length - 1; i > 0; i--) {
    const j = rng.int(0, i);
    [a[i], a[j]] = [a[j], a[i]];
  }
  return a;
}

/** Waits until the mail these tests caused has left the queue, so later tests find theirs promptly; prints how long it took. */
async function mailDrained(what: string) {
  const started = Date.now();
  let queued = 0;
  while (Date.now() - started < 120_000) {
    const [row] = await query<{ n: string }>(`SELECT count(*)::text AS n FROM outgoing_mail WHERE state = 'queued'`);
    queued = Number(row.n);
    if (queued === 0) break;
    await new Promise((r) => setTimeout(r, 250));
  }
  console.log(`concurrency: the mail of ${what} left the queue ${((Date.now() - started) / 1000).toFixed(1)} s after the last answer`);
  expect(queued).toBe(0);
}

const upload = (client: Client, files: Upload[], metadata: unknown) =>
  client.fetch('/api/submissions', { method: 'POST', body: submissionForm(files, metadata) });

describe('twenty moderators deciding the same hundred submissions at once', () => {
  const SUBMISSIONS = 100;
  const MODERATORS = 20;
  let ids: number[] = [];

  beforeAll(async () => {
    const contributor = await tokenClient('contributor');
    const created = await pool(Array.from({ length: SUBMISSIONS }, (_, i) => async () => {
      const res = await upload(contributor.client, [singleCurve(`unit-${i}.csv`)], metadataFor({ label: `Concurrency unit ${i}` }));
      expect(res.status).toBe(201);
      return ((await res.json()) as { id: number }).id;
    }), 4);
    ids = created;
  }, 180_000);

  it('decides each exactly once; every other attempt is a 409; audit rows equal decisions', async () => {
    const moderators = await Promise.all(Array.from({ length: MODERATORS }, () => tokenClient('moderator')));
    const decisionFor = (id: number) => (['verify', 'reject', 'request_changes'] as const)[id % 3];
    const started = Date.now();
    const statuses = await Promise.all(moderators.map((m, k) => pool(shuffled(ids, k + 1).map((id) => async () => {
      const res = await m.client.fetch(`/api/submissions/${id}/review`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ decision: decisionFor(id), note: `decided by moderator ${k}` }),
      });
      await res.arrayBuffer();
      return { id, status: res.status };
    }), 1)));
    const all = statuses.flat();
    const ok = all.filter((r) => r.status === 200);
    const conflicts = all.filter((r) => r.status === 409);
    const other = all.filter((r) => r.status !== 200 && r.status !== 409);
    const [counts] = await query<{ reviews: string; audits: string; undecided: string; twice: string }>(`SELECT
      (SELECT count(*) FROM reviews WHERE submission_id IN (:ids) AND kind IN ('verify', 'reject', 'request_changes'))::text AS reviews,
      (SELECT count(*) FROM audit_events WHERE target_type = 'submission' AND target_id IN (:sids) AND action IN ('submission.verify', 'submission.reject', 'submission.request_changes'))::text AS audits,
      (SELECT count(*) FROM submissions WHERE id IN (:ids) AND status = 'submitted')::text AS undecided,
      (SELECT count(*) FROM (SELECT submission_id FROM reviews WHERE submission_id IN (:ids) AND kind <> 'reply' GROUP BY submission_id HAVING count(*) > 1) t)::text AS twice`,
    { ids, sids: ids.map(String) });
    console.log(`concurrency: ${MODERATORS} moderators × ${SUBMISSIONS} submissions = ${all.length} decisions sent in ${((Date.now() - started) / 1000).toFixed(1)} s: ` +
      `${ok.length} decided, ${conflicts.length} answered 409, ${other.length} other; reviews ${counts.reviews}, audit rows ${counts.audits}`);
    expect(other).toEqual([]);
    expect(ok.length).toBe(SUBMISSIONS);
    expect(new Set(ok.map((r) => r.id)).size).toBe(SUBMISSIONS);
    expect(conflicts.length).toBe(SUBMISSIONS * (MODERATORS - 1));
    expect(counts).toEqual({ reviews: String(SUBMISSIONS), audits: String(SUBMISSIONS), undecided: '0', twice: '0' });
    // Every verified one is whole in the catalogue: its curve verified and its fitness rows present.
    const [broken] = await query<{ n: string }>(`SELECT count(*)::text AS n FROM submissions s JOIN curves c ON c.submission_id = s.id
      WHERE s.id IN (:ids) AND (c.status <> s.status OR (s.status = 'verified' AND NOT EXISTS (SELECT 1 FROM curve_fitness f WHERE f.curve_id = c.id)))`, { ids });
    expect(broken.n).toBe('0');
    await mailDrained('200 submissions and decisions');
  }, 240_000);
});

describe('fifty contributors uploading at once, valid and invalid mixed', () => {
  it('stores each upload whole or refuses it whole, and the counts match', async () => {
    const people = await Promise.all(Array.from({ length: 50 }, () => tokenClient('contributor')));
    type Plan = { kind: 'one' | 'set' | 'bad-second-file' | 'bad-metadata'; files: number; expect: number };
    const plans: Plan[] = people.map((_, i) => (
      [{ kind: 'one', files: 1, expect: 201 }, { kind: 'set', files: 3, expect: 201 }, { kind: 'bad-second-file', files: 2, expect: 422 }, { kind: 'bad-metadata', files: 1, expect: 422 }] as Plan[]
    )[i % 4]);
    const started = Date.now();
    const results = await Promise.all(people.map(async (p, i) => {
      const plan = plans[i];
      const seed = Date.now() % 1_000_000 + i * 104729;
      let files: Upload[];
      let metadata: unknown = metadataFor({ label: `Crowd upload ${i}` });
      if (plan.kind === 'set') {
        files = [0, 8, 16].map((aoi, k) => ({ name: `aoi-${aoi}.csv`, text: curveCsv({ aoiDeg: aoi, noiseSeed: seed + k }) }));
        metadata = metadataFor({ label: `Crowd set ${i}`, files: [0, 8, 16].map((aoi) => ({ name: `aoi-${aoi}.csv`, aoiDeg: aoi })) });
      } else if (plan.kind === 'bad-second-file') {
        files = [{ name: 'good.csv', text: curveCsv({ noiseSeed: seed }) }, { name: 'bad.csv', text: 'wavelength_nm,transmission\n650,0.5\nnot a number,0.6\n' }];
        metadata = metadataFor({ label: `Crowd broken ${i}`, files: [{ name: 'good.csv', aoiDeg: 0 }, { name: 'bad.csv', aoiDeg: 0 }] });
      } else {
        files = [{ name: 'one.csv', text: curveCsv({ noiseSeed: seed }) }];
        if (plan.kind === 'bad-metadata') metadata = metadataFor({ label: '', nominalFwhmNm: -1 });
      }
      const res = await upload(p.client, files, metadata);
      await res.arrayBuffer();
      return { user: p.id, plan, status: res.status };
    }));
    const wrongStatus = results.filter((r) => r.status !== r.plan.expect);
    const users = people.map((p) => p.id);
    const rows = await query<{ contributor_id: string; submissions: string; files: string; curves: string }>(`SELECT u.id AS contributor_id,
        (SELECT count(*) FROM submissions s WHERE s.contributor_id = u.id)::text AS submissions,
        (SELECT count(*) FROM submission_files f JOIN submissions s ON s.id = f.submission_id WHERE s.contributor_id = u.id)::text AS files,
        (SELECT count(*) FROM curves c WHERE c.contributor_id = u.id)::text AS curves
      FROM users u WHERE u.id IN (:users)`, { users });
    const byUser = new Map(rows.map((r) => [r.contributor_id, r]));
    const mismatched = results.filter((r) => {
      const row = byUser.get(r.user)!;
      const want = r.plan.expect === 201 ? { s: 1, n: r.plan.files } : { s: 0, n: 0 };
      return Number(row.submissions) !== want.s || Number(row.files) !== want.n || Number(row.curves) !== want.n;
    });
    const stored = results.filter((r) => r.status === 201).length;
    console.log(`concurrency: 50 uploads at once in ${((Date.now() - started) / 1000).toFixed(1)} s: ${stored} stored whole, ${results.length - stored} refused whole, ` +
      `${wrongStatus.length} unexpected statuses, ${mismatched.length} half-written`);
    expect(wrongStatus).toEqual([]);
    expect(mismatched).toEqual([]);
    await mailDrained('50 uploads');
  }, 240_000);
});
