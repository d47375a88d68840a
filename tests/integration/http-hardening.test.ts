import http from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, BASE, json, ORIGIN, signIn, type Client } from '../support/http';
import { query } from '../support/db';
import { makeUser } from '../support/users';
import { closeSequelize } from '@/db/connection';
import { pidListeningOn, rssBytes } from '@/scripts/lib/proc';

afterAll(() => closeSequelize());

const base = new URL(BASE);
const PREVIEW_LIMIT = Number(process.env.PREVIEW_RATE_PER_MINUTE ?? 120);

// A small flat-topped curve (invented), enough for the preview to answer 200.
function points() {
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  for (let i = 0; i < 40; i++) {
    wavelengthNm.push(640 + i);
    transmission.push(i > 10 && i < 30 ? 0.9 : 0.01);
  }
  return { wavelengthNm, transmission };
}

// Leaves the preview limit fresh for the browser tests that follow.
const clearPreviewCounts = () => query(`DELETE FROM rate_limits WHERE key LIKE 'rl:preview:%' RETURNING key`).catch(() => []);

describe('client address and rate limits (issue 10, item 5)', () => {
  afterAll(clearPreviewCounts);

  it('a client cannot escape the preview limit by writing its own X-Forwarded-For', async () => {
    await clearPreviewCounts();
    const body = JSON.stringify({ points: points() });
    const statuses: number[] = [];
    for (let i = 0; i <= PREVIEW_LIMIT; i++) {
      const res = await fetch(`${BASE}/api/curves/preview`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', 'x-forwarded-for': `203.0.113.${i % 250}, 198.51.100.7`, 'x-real-ip': `192.0.2.${i % 250}` },
        body,
      });
      await res.arrayBuffer();
      statuses.push(res.status);
    }
    expect(statuses.slice(0, PREVIEW_LIMIT).every((s) => s === 200)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    // One counter row per bucket, keyed on the socket's address, not one row per hit.
    const rows = await query<{ key: string; points: number }>(`SELECT key, points FROM rate_limits WHERE key LIKE 'rl:preview:%'`);
    expect(rows).toEqual([{ key: 'rl:preview:127.0.0.1', points: PREVIEW_LIMIT + 1 }]);
  });
});

/** Streams `total` bytes chunked (no Content-Length) until the server answers; what it sent by then. */
function chunkedUpload(path: string, contentType: string, total: number, prefix = ''): Promise<{ status: number; sentBytes: number; ms: number; body: string }> {
  return new Promise((resolve, reject) => {
    const started = Date.now();
    const chunk = Buffer.alloc(64 * 1024, 0x31); // "1111…": digits, for JSON and files alike
    let sent = 0;
    let answered = false;
    const req = http.request({ host: base.hostname, port: base.port, path, method: 'POST', headers: { 'content-type': contentType, 'transfer-encoding': 'chunked' } }, (res) => {
      answered = true;
      const parts: Buffer[] = [];
      res.on('data', (d: Buffer) => parts.push(d));
      res.on('end', () => {
        req.destroy();
        resolve({ status: res.statusCode ?? 0, sentBytes: sent, ms: Date.now() - started, body: Buffer.concat(parts).toString('utf8') });
      });
    });
    req.on('error', (err) => {
      if (!answered) reject(err);
    });
    const pump = () => {
      while (!answered && sent < total) {
        const ok = req.write(sent === 0 && prefix ? Buffer.concat([Buffer.from(prefix), chunk]) : chunk);
        sent += chunk.length;
        if (!ok) {
          req.once('drain', pump);
          return;
        }
      }
      if (!answered) req.end();
    };
    pump();
  });
}

describe('body caps while streaming (issue 10, item 7)', () => {
  const SIXTY_MB = 60 * 1024 * 1024;
  let pid: number | null;
  beforeAll(() => {
    pid = pidListeningOn(Number(base.port));
  });

  const cases = [
    { route: '/api/curves/preview', type: 'multipart/form-data; boundary=xyz', prefix: '--xyz\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\n' },
    { route: '/api/model/cone', type: 'application/json', prefix: '{"points":{"wavelengthNm":[' },
    { route: '/api/curves/preview', type: 'application/json', prefix: '{"points":' },
    { route: '/api/account/register', type: 'application/json', prefix: '{"name":"' },
  ];
  for (const c of cases) {
    it(`a 60 MB chunked ${c.type.split(';')[0]} body to ${c.route} gets 413 long before it is all sent`, async () => {
      expect(pid, 'the test server process, found by its port').toBeTruthy();
      const before = rssBytes(pid!)!;
      const r = await chunkedUpload(c.route, c.type, SIXTY_MB, c.prefix);
      expect(r.status, r.body).toBe(413);
      expect((JSON.parse(r.body) as { error: string }).error).toMatch(/over \d+ (MB|KB)/);
      // Refused at its cap (12 MB at most here) plus what sockets buffer on the way, not at 60 MB.
      expect(r.sentBytes).toBeLessThan(30 * 1024 * 1024);
      expect(r.ms).toBeLessThan(10_000);
      expect(rssBytes(pid!)! - before).toBeLessThan(40 * 1024 * 1024);
    });
  }

  it('an announced Content-Length over the cap is refused, and a client still sending reads the 413', async () => {
    const res = await fetch(`${BASE}/api/account/reset`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'x'.repeat(300 * 1024) }) });
    expect(res.status).toBe(413);
    const measurements = Array.from({ length: 12_000 }, (_, i) => ({ aoiDeg: i % 60, cwlNm: 656.28 - i * 1e-6 }));
    for (let i = 0; i < 5; i++) {
      const neff = await fetch(`${BASE}/api/model/neff`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ measurements }) });
      expect(neff.status).toBe(413);
      expect((await neff.json()) as { error: string }).toMatchObject({ error: expect.stringMatching(/over 256 KB/) });
    }
  });

  it('a sign-in form must announce a short length', async () => {
    // One chunk, sent whole before the answer, so the refusal can be read rather than cut off.
    const r = await chunkedUpload('/api/auth/callback/credentials', 'application/x-www-form-urlencoded', 1, 'email=');
    expect(r.status).toBe(411);
    const big = await fetch(`${BASE}/api/auth/callback/credentials`, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: 'email=' + 'a'.repeat(100 * 1024) });
    expect(big.status).toBe(413);
  });
});

describe('security headers (issue 10, item 10)', () => {
  it('pages carry a nonce-based script policy that each of their scripts satisfies, and cannot be framed', async () => {
    for (const path of ['/', '/signin', '/review', '/admin/users']) {
      const res = await fetch(BASE + path, { redirect: 'manual' });
      const csp = res.headers.get('content-security-policy') ?? '';
      const nonce = /'nonce-([^']+)'/.exec(csp)?.[1];
      expect(nonce, `${path}: ${csp}`).toBeTruthy();
      expect(csp).toContain("frame-ancestors 'none'");
      expect(csp).toContain("object-src 'none'");
      expect(csp).not.toContain("'unsafe-eval'");
      expect(/script-src[^;]*'unsafe-inline'/.test(csp)).toBe(false);
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      expect(res.headers.get('x-frame-options')).toBe('DENY');
      expect(res.headers.get('referrer-policy')).toBe('same-origin');
      // The test server is a production build.
      expect(res.headers.get('strict-transport-security')).toMatch(/max-age=\d{8}/);
      if (res.status === 200) {
        const html = await res.text();
        const tags = html.match(/<script\b[^>]*>/g) ?? [];
        expect(tags.length).toBeGreaterThan(0);
        for (const tag of tags) expect(tag, `${path}: ${tag}`).toContain(`nonce="${nonce}"`);
      }
    }
    const a = (await fetch(BASE + '/')).headers.get('content-security-policy');
    const b = (await fetch(BASE + '/')).headers.get('content-security-policy');
    expect(a).not.toBe(b);
  });

  it('API answers are sniff-proof data that load and frame nothing', async () => {
    const res = await fetch(`${BASE}/api/lines`);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
    expect(res.headers.get('content-security-policy')).toBe("default-src 'none'; frame-ancestors 'none'");
  });
});

describe('cross-site writes (issue 10, item 11)', () => {
  let owner: Client;
  const optic = { name: 'Cross-site test', fNumber: 4, obstruction: 0.2 };
  beforeAll(async () => {
    const u = await makeUser();
    owner = await signIn(u.email, u.password);
  });

  const raw = (path: string, init: RequestInit & { headers: Record<string, string> }) => fetch(BASE + path, { ...init, redirect: 'manual' });

  it('a cookie write from another origin is refused, whatever its body type', async () => {
    for (const type of ['text/plain', 'application/json', 'multipart/form-data; boundary=x']) {
      const res = await raw('/api/optics', { method: 'POST', headers: { cookie: owner.cookie, origin: 'https://evil.example', 'content-type': type }, body: JSON.stringify(optic) });
      expect(res.status, type).toBe(403);
    }
    const none = await json<{ items: { name: string }[] }>(await owner.fetch('/api/optics'));
    expect(JSON.stringify(none)).not.toContain('Cross-site test');
  });

  it('a cookie write without an Origin is refused; a text/plain or form body from our own pages is refused', async () => {
    expect((await raw('/api/optics', { method: 'POST', headers: { cookie: owner.cookie, 'content-type': 'application/json' }, body: JSON.stringify(optic) })).status).toBe(403);
    for (const type of ['text/plain', 'application/x-www-form-urlencoded', '']) {
      const res = await raw('/api/optics', { method: 'POST', headers: { cookie: owner.cookie, origin: ORIGIN, 'content-type': type }, body: JSON.stringify(optic) });
      expect(res.status, type).toBe(415);
    }
  });

  it('our own pages may write with JSON, and delete without a body', async () => {
    const created = await owner.fetch('/api/optics', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(optic) });
    expect(created.status).toBe(201);
    const { id } = await json<{ id: number }>(created);
    expect((await raw(`/api/optics/${id}`, { method: 'DELETE', headers: { cookie: owner.cookie, origin: 'https://evil.example' } })).status).toBe(403);
    expect((await raw(`/api/optics/${id}`, { method: 'DELETE', headers: { cookie: owner.cookie } })).status).toBe(403);
    expect((await owner.fetch(`/api/optics/${id}`, { method: 'DELETE' })).status).toBeLessThan(300);
  });

  it('a bearer-token write needs no Origin but still a JSON body', async () => {
    const made = await owner.fetch('/api/tokens', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'cross-site check' }) });
    const { token } = await json<{ token: string }>(made);
    const ok = await raw('/api/optics', { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: JSON.stringify({ ...optic, name: 'By token' }) });
    expect(ok.status).toBe(201);
    const plain = await raw('/api/optics', { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'text/plain' }, body: JSON.stringify(optic) });
    expect(plain.status).toBe(415);
  });

  it("next-auth's own form posts still work, and pages take no writes", async () => {
    const anon = anonymous();
    const csrf = await json<{ csrfToken: string }>(await anon.fetch('/api/auth/csrf'));
    expect(csrf.csrfToken.length).toBeGreaterThan(10);
    const page = await raw('/', { method: 'POST', headers: { origin: ORIGIN, 'content-type': 'application/json' }, body: '{}' });
    expect(page.status).toBe(405);
  });
});
