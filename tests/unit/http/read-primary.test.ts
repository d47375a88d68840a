import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { READ_PRIMARY_HEADER, WROTE_COOKIE, settleReadSource } from '@/lib/http/read-primary';

// A real Node HTTP server running the same step server.ts runs: each answer reports whether the
// request was marked to read the primary, with the status the client asks for (?status=N).
let server: Server;
let base = '';

beforeAll(async () => {
  process.env.READ_PRIMARY_AFTER_WRITE_SECONDS = '1';
  server = createServer((req, res) => {
    settleReadSource(req, res);
    const status = Number(new URL(req.url ?? '/', 'http://x').searchParams.get('status') ?? 200);
    if (req.url?.includes('app-cookie')) res.setHeader('set-cookie', 'app=1; Path=/');
    res.writeHead(status, { 'content-type': 'text/plain' });
    res.end(req.headers[READ_PRIMARY_HEADER] === '1' ? 'primary' : 'any');
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(() => {
  delete process.env.READ_PRIMARY_AFTER_WRITE_SECONDS;
  server.close();
});

const read = async (headers: Record<string, string> = {}) => (await fetch(`${base}/read`, { headers })).text();
const write = (path: string, headers: Record<string, string> = {}) => fetch(`${base}${path}`, { method: 'POST', headers });

describe('reads after the caller’s own write stay on the primary', () => {
  it('a signed-in write that succeeds sets a short-lived cookie beside the app’s own, and that cookie marks the reads after it', async () => {
    expect((await write('/w')).headers.getSetCookie()).toEqual([]); // anonymous: a preview or a model call
    const res = await write('/w?app-cookie', { authorization: 'Bearer token-c' });
    const cookies = res.headers.getSetCookie();
    expect(cookies).toContain('app=1; Path=/');
    const mark = cookies.find((c) => c.startsWith(`${WROTE_COOKIE}=`));
    expect(mark).toMatch(/Max-Age=1;.*HttpOnly/);
    expect(await read({ cookie: `${WROTE_COOKIE}=1` })).toBe('primary');
    expect(await read()).toBe('any');
  });

  it('a refused write marks nothing', async () => {
    const res = await write('/w?status=422', { authorization: 'Bearer refused-token' });
    expect(res.headers.getSetCookie()).toEqual([]);
    expect(await read({ authorization: 'Bearer refused-token' })).toBe('any');
  });

  it('without cookies, the same credential reads the primary for the window, then no longer', async () => {
    await write('/w', { authorization: 'Bearer token-a' });
    expect(await read({ authorization: 'Bearer token-a' })).toBe('primary');
    expect(await read({ authorization: 'Bearer token-b' })).toBe('any');
    await write('/w', { cookie: 'next-auth.session-token=abc' });
    expect(await read({ cookie: 'next-auth.session-token=abc; other=1' })).toBe('primary');
    expect(await read({ cookie: 'next-auth.session-token=abd' })).toBe('any');
    await new Promise((r) => setTimeout(r, 1_100));
    expect(await read({ authorization: 'Bearer token-a' })).toBe('any');
  });

  it('a client cannot mark its own request (the header is the server’s)', async () => {
    expect(await read({ [READ_PRIMARY_HEADER]: '1' })).toBe('any');
  });
});
