// Catalogue reads on a streaming replica (issue 17; lib/catalogue/read-source.ts). scripts/test.sh
// starts a real PostgreSQL hot standby of the test database (pg_basebackup -R, streaming
// replication) and gives the server its address as DATABASE_REPLICA_URL. Which database answered
// is proved by data alone: while the standby's replay is paused (pg_wal_replay_pause, PostgreSQL 15
// manual §9.27.4 "Recovery Control Functions"), a curve verified on the primary is missing from
// every read the replica serves and present in every read the primary serves.
import { execFileSync } from 'node:child_process';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';
import { closeSequelize } from '@/db/connection';

const REPLICA_URL = process.env.TEST_REPLICA_URL;
const REPLICA_DATA = process.env.TEST_REPLICA_DATA;
const PGBIN = process.env.PGBIN ?? '/usr/lib/postgresql/15/bin';

type Page = { items: { id: number }[]; total: number };

/** pg_ctl on the standby, as its owner: PostgreSQL refuses to run as root. */
function standby(action: 'stop' | 'start') {
  const args = action === 'stop' ? ['-D', REPLICA_DATA!, '-m', 'fast', '-w', 'stop'] : ['-D', REPLICA_DATA!, '-w', '-t', '60', '-l', `${REPLICA_DATA}/server.log`, 'start'];
  const [cmd, ...rest] = process.getuid?.() === 0 ? ['runuser', '-u', 'postgres', '--', `${PGBIN}/pg_ctl`, ...args] : [`${PGBIN}/pg_ctl`, ...args];
  execFileSync(cmd, rest, { stdio: 'ignore' });
}

async function onStandby<T extends pg.QueryResultRow>(sql: string): Promise<T[]> {
  const c = new pg.Client({ connectionString: REPLICA_URL, connectionTimeoutMillis: 3_000 });
  await c.connect();
  try {
    return (await c.query<T>(sql)).rows;
  } finally {
    await c.end();
  }
}

const pauseReplay = () => onStandby('SELECT pg_wal_replay_pause()');
const resumeReplay = () => onStandby('SELECT pg_wal_replay_resume()');

let serial = 0;
/** A curve submitted by the contributor and verified by the moderator on the primary: its id and a word only it carries. */
async function verifiedCurve(contributor: Client, moderator: Client, cwlNm = 656.3) {
  const word = `replicaprobe${Date.now()}x${++serial}`;
  const up = await contributor.fetch('/api/submissions', {
    method: 'POST',
    body: submissionForm([singleCurve('replica.csv', { cwlNm })], metadataFor({ label: `Replica probe ${word}`, notes: word, nominalCwlNm: cwlNm })),
  });
  expect(up.status, await up.clone().text()).toBe(201);
  const { id, curveIds } = await json<{ id: number; curveIds: number[] }>(up);
  const review = await moderator.fetch(`/api/submissions/${id}/review`, {
    method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ decision: 'verify', note: 'replica test' }),
  });
  expect(review.status, await review.clone().text()).toBe(200);
  return { id: curveIds[0], word, verifiedAt: Date.now() };
}

async function finds(client: Client, qs: string, id: number): Promise<boolean> {
  const res = await client.fetch(`/api/curves?${qs}&pageSize=100`);
  expect(res.status, await res.clone().text()).toBe(200);
  return (await json<Page>(res)).items.some((i) => i.id === id);
}

/** Polls until `check` holds or the deadline passes; the milliseconds it took, or null. */
async function within(ms: number, check: () => Promise<boolean>): Promise<number | null> {
  const start = Date.now();
  while (Date.now() - start < ms) {
    if (await check()) return Date.now() - start;
    await new Promise((r) => setTimeout(r, 25));
  }
  return null;
}

// The fitness search of the in-process copy: a narrow CWL window around the probe's own CWL.
const fitnessAround = (cwl: number) => `line=Ha&fNumber=4&cwlMin=${(cwl - 0.15).toFixed(2)}&cwlMax=${(cwl + 0.15).toFixed(2)}`;

describe.skipIf(!REPLICA_URL || !REPLICA_DATA)('catalogue reads on the streaming replica', () => {
  let contributor: Client;
  let moderator: Client;

  beforeAll(async () => {
    contributor = await signIn('contributor@bandcone.test');
    moderator = await signIn('moderator@bandcone.test');
    const [r] = await onStandby<{ recovering: boolean }>('SELECT pg_is_in_recovery() AS recovering');
    // the server under test reads a real hot standby, not a second name for the primary
    expect(r.recovering).toBe(true);
  });

  afterAll(async () => {
    // whatever happened, leave the standby running and replaying for the tests after these
    try {
      standby('start');
    } catch {
      /* already running */
    }
    await resumeReplay().catch(() => undefined);
    await closeSequelize();
  });

  it('a curve verified on the primary appears in replica-served search within the replica lag', async () => {
    const probe = await verifiedCurve(contributor, moderator);
    const visitor = anonymous();
    const tookMs = await within(10_000, () => finds(visitor, `q=${probe.word}`, probe.id));
    const [lag] = await query<{ replay_lag: string | null; state: string }>(`SELECT state, replay_lag::text FROM pg_stat_replication`);
    console.log(`replica: visible in replica-served search ${tookMs} ms after the verify answered (the first search included); pg_stat_replication replay_lag ${lag?.replay_lag ?? 'n/a'} (${lag?.state})`);
    expect(lag?.state).toBe('streaming');
    expect(tookMs).not.toBeNull();
  });

  it('reads are served by the replica; a caller who just wrote reads the primary', async () => {
    await pauseReplay();
    try {
      const cwl = 657.9;
      const probe = await verifiedCurve(contributor, moderator, cwl);
      const visitor = anonymous();
      // the replica has not replayed the verification: search, fitness search (the in-process copy), curve page, points, export
      expect(await finds(visitor, `q=${probe.word}`, probe.id)).toBe(false);
      expect(await finds(visitor, fitnessAround(cwl), probe.id)).toBe(false);
      expect((await visitor.fetch(`/api/curves/${probe.id}`)).status).toBe(404);
      expect((await visitor.fetch(`/api/curves/${probe.id}/points`)).status).toBe(404);
      const exported = await visitor.fetch(`/api/curves/export.csv?q=${probe.word}`);
      expect(exported.status).toBe(200);
      expect(await exported.text()).not.toContain(`# curve ${probe.id}`);

      // the moderator wrote a moment ago (the answer's cookie): their reads come from the primary
      expect(await finds(moderator, `q=${probe.word}`, probe.id)).toBe(true);
      expect(await finds(moderator, fitnessAround(cwl), probe.id)).toBe(true);
      expect((await moderator.fetch(`/api/curves/${probe.id}`)).status).toBe(200);
      // so do the contributor's (they submitted): their own curve page
      expect((await contributor.fetch(`/api/curves/${probe.id}`)).status).toBe(200);
      // a client that keeps no cookies but signs its requests the same way: the server remembers the writer for a few seconds
      const sameSession = contributor.cookie.split('; ').filter((c) => !c.startsWith('bandcone-wrote=')).join('; ');
      const bare = await fetch(`${process.env.TEST_BASE_URL}/api/curves/${probe.id}`, { headers: { cookie: sameSession } });
      expect(bare.status).toBe(200);
      // sign-in, sessions and a user's own submissions never touch the replica
      const mine = await contributor.fetch('/api/submissions');
      expect(mine.status).toBe(200);

      await resumeReplay();
      const tookMs = await within(10_000, () => finds(visitor, `q=${probe.word}`, probe.id));
      console.log(`replica: after replay resumed, the verified curve reached replica-served search in ${tookMs} ms`);
      expect(tookMs).not.toBeNull();
      expect(await finds(visitor, fitnessAround(cwl), probe.id)).toBe(true);
      expect((await visitor.fetch(`/api/curves/${probe.id}`)).status).toBe(200);
    } finally {
      await resumeReplay().catch(() => undefined);
    }
  });

  it('stays up when the replica stops (reads degrade to the primary) and returns to it when it is back', async () => {
    const visitor = anonymous();
    const before = await verifiedCurve(contributor, moderator, 658.4);
    expect(await within(10_000, () => finds(visitor, `q=${before.word}`, before.id))).not.toBeNull();

    standby('stop');
    try {
      // every catalogue read still answers, and promptly: the first meets the lost replica and runs again on the primary
      const slowest = { ms: 0, what: '' };
      const timed = async (what: string, path: string) => {
        const t = Date.now();
        const res = await visitor.fetch(path);
        const ms = Date.now() - t;
        if (ms > slowest.ms) Object.assign(slowest, { ms, what });
        expect(res.status, `${what}: ${await res.clone().text()}`).toBe(200);
        return res;
      };
      await timed('word search', `/api/curves?q=${before.word}`);
      await timed('fitness search', `/api/curves?${fitnessAround(658.4)}`);
      await timed('curve detail', `/api/curves/${before.id}`);
      await timed('points', `/api/curves/${before.id}/points`);
      await timed('curve page', `/curves/${before.id}`);
      await timed('search page', `/curves?q=${before.word}`);
      await timed('export', `/api/curves/export.csv?q=${before.word}`);
      console.log(`replica stopped: every read answered 200; slowest ${slowest.ms} ms (${slowest.what})`);
      expect(slowest.ms).toBeLessThan(5_000);

      // what is verified while it is down is served by the primary at once
      const during = await verifiedCurve(contributor, moderator, 658.9);
      expect(await finds(anonymous(), `q=${during.word}`, during.id)).toBe(true);
    } finally {
      standby('start');
    }

    // back: once the probe sees it, reads return to it (proved again with replay paused)
    await within(15_000, async () => (await onStandby<{ ok: number }>('SELECT 1 AS ok').catch(() => []))[0]?.ok === 1);
    await pauseReplay();
    try {
      const after = await verifiedCurve(contributor, moderator, 659.3);
      const tookMs = await within(10_000, async () => !(await finds(anonymous(), `q=${after.word}`, after.id)));
      console.log(`replica restarted: reads returned to it within ${tookMs} ms`);
      expect(tookMs).not.toBeNull();
    } finally {
      await resumeReplay();
    }
  });
});
