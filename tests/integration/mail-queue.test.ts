import net from 'node:net';
import { randomUUID } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { BASE, json, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { enqueueMail } from '@/lib/mail/queue';
import { metadataFor, singleCurve, submissionForm } from './submissions-fixtures';

// Reliability issue item 2, "mail that cannot be lost": the mail server goes away, moderators
// decide, the decisions commit at once, the mail waits in the queue (retried with backoff,
// visible to admins) and arrives exactly once when the server is back.
// The test server's catcher (scripts/mail-catcher.ts) closes and reopens its port on a NOTIFY.

const SMTP_PORT = Number(new URL(process.env.SMTP_URL ?? 'smtp://127.0.0.1:2526').port);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function portOpen(): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect(SMTP_PORT, '127.0.0.1');
    socket.once('connect', () => { socket.destroy(); resolve(true); });
    socket.once('error', () => resolve(false));
  });
}

async function catcher(state: 'down' | 'up') {
  await query(`SELECT pg_notify('mail_catcher', :state) AS sent`, { state });
  const until = Date.now() + 10_000;
  while (Date.now() < until) {
    if ((await portOpen()) === (state === 'up')) return;
    await sleep(100);
  }
  throw new Error(`the mail catcher did not go ${state}`);
}

async function until<T>(what: string, timeoutMs: number, probe: () => Promise<T | undefined | false>): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await sleep(250);
  }
}

const post = (client: Client, path: string, body: unknown) =>
  client.fetch(path, { method: 'POST', headers: { 'content-type': 'application/json', origin: BASE }, body: JSON.stringify(body) });

afterAll(async () => {
  await catcher('up').catch(() => undefined);
  await closeSequelize();
});

describe('mail that cannot be lost', () => {
  it('relay down → 10 decisions commit at once → relay up → all 10 mails arrive exactly once', async () => {
    const run = randomUUID().slice(0, 8);
    const contributor = await makeUser('contributor');
    const c = await signIn(contributor.email, contributor.password);
    const moderator = await signIn('moderator@bandcone.test');
    const admin = await signIn('admin@bandcone.test');

    const ids: number[] = [];
    for (let i = 0; i < 10; i++) {
      const res = await c.fetch('/api/submissions', { method: 'POST', headers: { origin: BASE }, body: submissionForm([singleCurve()], metadataFor({ label: `Outage ${run} #${i}` })) });
      expect(res.status).toBe(201);
      ids.push((await json(res)).id);
    }
    // Let the review-queue mail of those uploads go out first.
    await until('the upload mail to be sent', 30_000, async () =>
      Number((await query<{ n: string }>(`SELECT count(*) AS n FROM outgoing_mail WHERE state = 'queued' AND subject LIKE :like`, { like: `%Outage ${run}%` }))[0].n) === 0);

    await catcher('down');
    const started = Date.now();
    const latencies: number[] = [];
    for (const [i, id] of ids.entries()) {
      const t0 = performance.now();
      const res = await post(moderator, `/api/submissions/${id}/review`, { decision: i % 2 ? 'request_changes' : 'verify', note: `Decided during the outage (${i})` });
      latencies.push(performance.now() - t0);
      expect(res.status).toBe(200);
    }
    // Every decision committed, with its mail queued beside it.
    const statuses = await query<{ status: string }>(`SELECT status FROM submissions WHERE id IN (:ids)`, { ids });
    expect(statuses.every((s) => s.status !== 'submitted')).toBe(true);
    const subjectLike = `%Outage ${run}%was%`;
    const rows = () => query<{ state: string; attempts: number; last_error: string | null }>(
      `SELECT state, attempts, last_error FROM outgoing_mail WHERE kind = 'decision' AND :email = ANY(recipients) AND subject LIKE :subjectLike`,
      { email: contributor.email, subjectLike },
    );
    expect(await rows()).toHaveLength(10);

    // While the relay is away the queue keeps trying (at least twice each), and sends nothing.
    await until('two failed tries of each mail', 30_000, async () => {
      const r = await rows();
      return r.length === 10 && r.every((m) => m.state === 'queued' && m.attempts >= 2 && !!m.last_error);
    });
    const arrivedEarly = await query(`SELECT 1 FROM mail_messages WHERE :email = ANY(envelope_to) AND subject LIKE :subjectLike`, { email: contributor.email, subjectLike });
    expect(arrivedEarly).toHaveLength(0);

    // A message whose every try fails ends as failed, after its number of tries.
    const limit = process.env.MAIL_RETRY_LIMIT;
    process.env.MAIL_RETRY_LIMIT = '1';
    const drillId = await enqueueMail({ kind: 'drill', to: contributor.email, subject: `Drill ${run}`, text: 'never delivered' });
    if (limit === undefined) delete process.env.MAIL_RETRY_LIMIT;
    else process.env.MAIL_RETRY_LIMIT = limit;
    await until('the drill mail to fail', 30_000, async () =>
      (await query<{ state: string; attempts: number }>(`SELECT state, attempts FROM outgoing_mail WHERE id = :drillId`, { drillId }))[0]?.state === 'failed');

    // Admins see each message's state.
    const page = await (await admin.fetch(`/admin/mail?to=${encodeURIComponent(contributor.email)}`)).text();
    expect(page).toMatch(/queued, \d+ of \d+ tries so far/);
    expect(page).toContain('failed after 2 tries');
    expect(page).toContain('Last error');

    const downSeconds = (Date.now() - started) / 1000;
    await catcher('up');
    const upAt = Date.now();
    const arrived = await until('all 10 decision mails', 60_000, async () => {
      const got = await query<{ subject: string }>(`SELECT subject FROM mail_messages WHERE :email = ANY(envelope_to) AND subject LIKE :subjectLike`, { email: contributor.email, subjectLike });
      return got.length >= 10 ? got : undefined;
    });
    const recoverSeconds = (Date.now() - upAt) / 1000;
    // Anything sent twice would show up now.
    await sleep(4000);
    const final = await query<{ subject: string }>(`SELECT subject FROM mail_messages WHERE :email = ANY(envelope_to) AND subject LIKE :subjectLike`, { email: contributor.email, subjectLike });
    expect(final).toHaveLength(10);
    for (let i = 0; i < 10; i++) expect(final.filter((m) => m.subject.includes(`Outage ${run} #${i}"`))).toHaveLength(1);
    expect(arrived.length).toBe(10);
    expect((await rows()).every((m) => m.state === 'sent')).toBe(true);
    expect(await query(`SELECT 1 FROM mail_messages WHERE subject = :s`, { s: `Drill ${run}` })).toHaveLength(0);
    const tries = (await rows()).map((m) => m.attempts);
    console.log(
      `mail outage: 10 decisions while the relay was down, slowest answer ${Math.max(...latencies).toFixed(0)} ms; ` +
      `relay down ${downSeconds.toFixed(1)} s; tries per mail ${Math.min(...tries)}–${Math.max(...tries)}; ` +
      `all 10 delivered ${recoverSeconds.toFixed(1)} s after the relay came back, each exactly once`,
    );
  }, 180_000);
});
