import { describe, expect, it } from 'vitest';
import { carriesSessionCookie, guardRequest, originAllowed } from '@/lib/http/request-guard';

// The OWASP CSRF cheat sheet's origin check (common practice): a cookie-carried write must
// name our origin; plain-form and text/plain bodies are refused outright.
const HOST = '127.0.0.1:3000';
const SESSION = 'next-auth.session-token=abc';
const guard = (method: string, path: string, headers: Record<string, string>) => guardRequest({ method, path, headers: { host: HOST, ...headers } });

describe('guardRequest', () => {
  it('leaves reads alone', () => {
    expect(guard('GET', '/api/optics', { cookie: SESSION, origin: 'https://evil.example' })).toBeNull();
    expect(guard('HEAD', '/', {})).toBeNull();
  });

  it('refuses another origin, with or without a cookie', () => {
    expect(guard('POST', '/api/optics', { cookie: SESSION, origin: 'https://evil.example', 'content-type': 'application/json' })?.status).toBe(403);
    expect(guard('POST', '/api/model/cone', { origin: 'https://evil.example', 'content-type': 'application/json' })?.status).toBe(403);
    expect(guard('POST', '/api/optics', { cookie: SESSION, origin: 'null', 'content-type': 'application/json' })?.status).toBe(403);
  });

  it('asks a cookie write for an Origin, but not a bearer-token write', () => {
    expect(guard('POST', '/api/optics', { cookie: SESSION, 'content-type': 'application/json' })?.status).toBe(403);
    expect(guard('POST', '/api/optics', { cookie: SESSION, authorization: 'Bearer x', 'content-type': 'application/json' })).toBeNull();
    expect(guard('POST', '/api/model/cone', { 'content-type': 'application/json' })).toBeNull();
  });

  it('takes only JSON or multipart bodies', () => {
    const own = { cookie: SESSION, origin: `http://${HOST}` };
    expect(guard('POST', '/api/optics', { ...own, 'content-type': 'application/json; charset=utf-8' })).toBeNull();
    expect(guard('POST', '/api/submissions', { ...own, 'content-type': 'multipart/form-data; boundary=x' })).toBeNull();
    for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'application/jsonx', '']) {
      expect(guard('PATCH', '/api/optics/1', { ...own, 'content-type': type, 'content-length': '2' })?.status, type).toBe(415);
    }
  });

  it('lets a bodiless DELETE through once its Origin is ours', () => {
    expect(guard('DELETE', '/api/tokens/3', { cookie: SESSION, origin: `http://${HOST}` })).toBeNull();
    expect(guard('DELETE', '/api/tokens/3', { cookie: SESSION, origin: `http://${HOST}`, 'content-length': '5', 'content-type': 'text/plain' })?.status).toBe(415);
    expect(guard('DELETE', '/api/tokens/3', { cookie: SESSION })?.status).toBe(403);
  });

  it("leaves next-auth's form posts to its own CSRF token, within a short announced length", () => {
    const form = { 'content-type': 'application/x-www-form-urlencoded', origin: `http://${HOST}` };
    expect(guard('POST', '/api/auth/callback/credentials', { ...form, 'content-length': '120' })).toBeNull();
    expect(guard('POST', '/api/auth/signout', { ...form, cookie: SESSION, 'content-length': '60' })).toBeNull();
    expect(guard('POST', '/api/auth/signout', { ...form, cookie: SESSION, 'content-length': '60', origin: 'https://evil.example' })?.status).toBe(403);
    expect(guard('POST', '/api/auth/callback/credentials', { ...form, 'content-length': String(1 << 20) })?.status).toBe(413);
    expect(guard('POST', '/api/auth/callback/credentials', { ...form, 'transfer-encoding': 'chunked' })?.status).toBe(411);
  });

  it('judges the path routing will see, and refuses writes to pages', () => {
    const form = { 'content-type': 'text/plain', origin: `http://${HOST}`, 'content-length': '2' };
    expect(guard('POST', '/api/auth/../optics', form)?.status).toBe(415);
    expect(guard('POST', '/api/auth/%2e%2e/optics', form)?.status).toBe(415);
    expect(guard('POST', '/review', { ...form, 'content-type': 'application/json' })?.status).toBe(405);
  });
});

describe('helpers', () => {
  it('recognises the session cookie in its forms', () => {
    expect(carriesSessionCookie('a=1; next-auth.session-token=x')).toBe(true);
    expect(carriesSessionCookie('__Secure-next-auth.session-token.0=x')).toBe(true);
    expect(carriesSessionCookie('next-auth.csrf-token=x; theme=night')).toBe(false);
    expect(carriesSessionCookie(undefined)).toBe(false);
  });

  it('allows the Host the request was sent to, or the configured public URL', () => {
    expect(originAllowed('http://127.0.0.1:3000', '127.0.0.1:3000', undefined)).toBe(true);
    expect(originAllowed('https://bandcone.example', 'internal:3000', 'https://bandcone.example')).toBe(true);
    expect(originAllowed('https://bandcone.example.evil.example', '127.0.0.1:3000', 'https://bandcone.example')).toBe(false);
    expect(originAllowed('not a url', '127.0.0.1:3000', undefined)).toBe(false);
  });
});
