import { afterEach, describe, expect, it, vi } from 'vitest';
import { ZodError, z } from 'zod';
import { ConnectionRefusedError } from 'sequelize';
import { ApiError, api, decodeResponse, getJson, NO_ANSWER, request } from '@/lib/api-client';
import { errorResponse } from '@/lib/http/errors';
import { RETRY_AFTER_SECONDS } from '@/lib/http/unavailable';

// The body of every refusal is docs/api.md §Errors: { error, details: [{ field | line, message }] }.
// Retry-After is "delay-seconds" or an HTTP-date (RFC 9110 §10.2.3).

afterEach(() => vi.unstubAllGlobals());

describe('the one error decoder of the browser', () => {
  it('reads a 422 with field details as the server writes it (errorResponse of a zod refusal)', async () => {
    const zodError = z.object({ name: z.string().min(1, 'Name the token') }).safeParse({ name: '' }).error as ZodError;
    const out = await decodeResponse(errorResponse(zodError));
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.status).toBe(422);
    expect(out.failure.error).toBe('The request is not valid: Name the token (name).');
    expect(out.failure.details).toEqual([{ field: 'name', message: 'Name the token' }]);
    expect(out.failure.retryAfterSeconds).toBeUndefined();
  });

  it('reads line-numbered details of a file refusal', async () => {
    const body = { error: 'bench.csv: line 7 is not a number pair.', details: [{ line: 7, message: 'bench.csv: "1O0" is not a number' }] };
    const out = await decodeResponse(Response.json(body, { status: 422 }));
    expect(out).toEqual({ ok: false, status: 422, failure: body });
  });

  it('reads a 503 with Retry-After in seconds, as the server sends it when the database is down', async () => {
    const res = errorResponse(new ConnectionRefusedError(Object.assign(new Error('refused'), { code: 'ECONNREFUSED' }) as never));
    expect(res.status).toBe(503);
    const out = await decodeResponse(res);
    if (out.ok) throw new Error('a 503 decoded as success');
    expect(out.status).toBe(503);
    expect(out.failure.retryAfterSeconds).toBe(RETRY_AFTER_SECONDS);
    expect(out.failure.error.length).toBeGreaterThan(10);
  });

  it('reads Retry-After given as an HTTP-date (RFC 9110 §10.2.3)', async () => {
    const at = new Date(Date.now() + 120_000).toUTCString();
    const out = await decodeResponse(Response.json({ error: 'Down for a moment.' }, { status: 503, headers: { 'retry-after': at } }));
    if (out.ok) throw new Error('a 503 decoded as success');
    // toUTCString drops the milliseconds, so the delay is 119–120 s
    expect(out.failure.retryAfterSeconds).toBeGreaterThanOrEqual(119);
    expect(out.failure.retryAfterSeconds).toBeLessThanOrEqual(120);
  });

  it('turns a body that is not our JSON (a proxy page) into a sentence naming the status', async () => {
    const out = await decodeResponse(new Response('<html>Bad gateway</html>', { status: 502, headers: { 'content-type': 'text/html' } }));
    expect(out).toEqual({ ok: false, status: 502, failure: { error: 'The server answered 502.' } });
  });

  it('a network failure is status 0 with the caller\'s sentence; an abort is thrown on', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => { throw new TypeError('fetch failed'); }));
    const out = await request('/api/tokens', {}, 'No network.');
    expect(out).toEqual({ ok: false, status: NO_ANSWER, failure: { error: 'No network.' } });
    const fit = await api.model.neff({ measurements: [{ aoiDeg: 0, cwlNm: 656 }, { aoiDeg: 10, cwlNm: 652 }] });
    expect(fit).toEqual({ ok: false, status: 0, failure: { error: 'The fit could not reach the server.' } });

    vi.stubGlobal('fetch', vi.fn(async () => { throw new DOMException('aborted', 'AbortError'); }));
    await expect(request('/api/tokens')).rejects.toThrow('aborted');
  });

  it('getJson (the SWR fetcher) throws the refusal as an ApiError and returns the body otherwise', async () => {
    vi.stubGlobal('fetch', vi.fn(async (url: string) => (url.includes('bad') ? Response.json({ error: 'Unknown sort "x".', details: [] }, { status: 400 }) : Response.json({ items: [], total: 0 }))));
    await expect(getJson('/api/curves?sort=good')).resolves.toEqual({ items: [], total: 0 });
    const err = await getJson('/api/curves?sort=bad').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect((err as ApiError).status).toBe(400);
    expect((err as ApiError).message).toBe('Unknown sort "x".');
  });

  it('sends JSON with its content type, and the method and address of the route', async () => {
    const seen: { url: string; init: RequestInit }[] = [];
    vi.stubGlobal('fetch', vi.fn(async (url: string, init: RequestInit) => { seen.push({ url, init }); return Response.json({ id: 3, status: 'verified' }); }));
    const out = await api.submissions.decide(3, { decision: 'verify' });
    expect(out).toEqual({ ok: true, data: { id: 3, status: 'verified' } });
    expect(seen[0].url).toBe('/api/submissions/3/review');
    expect(seen[0].init.method).toBe('POST');
    expect(new Headers(seen[0].init.headers).get('content-type')).toBe('application/json');
    expect(JSON.parse(String(seen[0].init.body))).toEqual({ decision: 'verify' });
  });
});
