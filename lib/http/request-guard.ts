// Rules every request meets before the app sees it, applied by our server (server.ts).
//
// Cross-site writes: a browser attaches the session cookie to a request another site starts,
// and SameSite=Lax does not cover every case (a top-level POST within two minutes of sign-in,
// sibling subdomains). So a state-changing request that rides on the session cookie must name
// our origin in `Origin`, which browsers set and pages cannot forge, and must carry JSON or
// multipart — never a body a plain HTML form or `text/plain` fetch could send unannounced
// (common practice: the OWASP CSRF cheat sheet's "verifying origin with standard headers").
// next-auth's own routes post forms and check their own double-submit token; a request signed
// with a bearer token carries no ambient authority, so only its body type is checked.

import { configuredSiteUrl } from './site';

export type GuardInput = {
  method: string;
  path: string;
  headers: Record<string, string | string[] | undefined>;
};

export type GuardRefusal = { status: number; error: string };

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
// next-auth's forms are a few hundred bytes; nothing there needs more.
export const AUTH_BODY_MAX = 64 * 1024;

function one(v: string | string[] | undefined): string | undefined {
  return Array.isArray(v) ? v[0] : v;
}

/** The session cookie next-auth sets (plain, `__Secure-` prefixed, or split into `.0`, `.1` chunks). */
export function carriesSessionCookie(cookieHeader: string | undefined): boolean {
  return sessionCookieValue(cookieHeader) !== null;
}

/** The session cookie's value (its chunks joined in the order sent), or null when there is none. */
export function sessionCookieValue(cookieHeader: string | undefined): string | null {
  if (!cookieHeader) return null;
  const values: string[] = [];
  for (const part of cookieHeader.split(';')) {
    const eq = part.indexOf('=');
    const name = part.slice(0, eq >>> 0).trim();
    if (name === 'next-auth.session-token' || name === '__Secure-next-auth.session-token' ||
      name.startsWith('next-auth.session-token.') || name.startsWith('__Secure-next-auth.session-token.')) {
      values.push(eq < 0 ? '' : part.slice(eq + 1).trim());
    }
  }
  return values.length ? values.join('.') : null;
}

function hostOf(url: string): string | null {
  try {
    return new URL(url).host.toLowerCase();
  } catch {
    return null;
  }
}

/** Origins allowed to write: the host the request was sent to, and the configured public URL. */
export function originAllowed(origin: string, hostHeader: string | undefined, publicUrl = configuredSiteUrl()): boolean {
  if (origin === 'null') return false;
  const host = hostOf(origin);
  if (!host) return false;
  if (hostHeader && host === hostHeader.trim().toLowerCase()) return true;
  return !!publicUrl && host === hostOf(publicUrl);
}

function hasBody(headers: GuardInput['headers']): boolean {
  const length = one(headers['content-length']);
  if (one(headers['transfer-encoding'])) return true;
  return length !== undefined && length !== '0';
}

function mediaType(headers: GuardInput['headers']): string {
  const raw = one(headers['content-type']) ?? '';
  const semi = raw.indexOf(';');
  return (semi < 0 ? raw : raw.slice(0, semi)).trim().toLowerCase();
}

/** The path as routing will see it: dot segments resolved, percent escapes decoded. */
export function routedPath(rawUrl: string): string {
  try {
    return decodeURIComponent(new URL(rawUrl, 'http://x').pathname);
  } catch {
    return new URL(rawUrl, 'http://x').pathname;
  }
}

/**
 * A path whose percent-encoding is not valid UTF-8 (e.g. /api/curves/%E0%A4%A) makes Next fail
 * while decoding route params, answering a bare 500. It is the client's mistake: 400 with a reason.
 */
function brokenEncoding(rawPath: string): GuardRefusal | null {
  const q = rawPath.indexOf('?');
  const path = q >= 0 ? rawPath.slice(0, q) : rawPath;
  if (!path.includes('%')) return null;
  try {
    decodeURIComponent(path);
    return null;
  } catch {
    return { status: 400, error: 'The address holds broken percent-encoding; encode it as UTF-8.' };
  }
}

export function guardRequest({ method, path: rawPath, headers }: GuardInput): GuardRefusal | null {
  const broken = brokenEncoding(rawPath);
  if (broken) return broken;
  const m = method.toUpperCase();
  if (!STATE_CHANGING.has(m)) return null;
  const path = routedPath(rawPath);
  const origin = one(headers.origin);
  const bearer = (one(headers.authorization) ?? '').startsWith('Bearer ');
  const cookieBased = !bearer && carriesSessionCookie(one(headers.cookie));

  // A browser on another site: refused whatever it carries, since we never answer CORS.
  if (origin !== undefined && !originAllowed(origin, one(headers.host))) {
    return { status: 403, error: 'This request came from another site; Bandcone accepts changes only from its own pages.' };
  }
  if (cookieBased && origin === undefined) {
    return { status: 403, error: 'Requests signed in by cookie must say where they come from (an Origin header); scripts should use an API token.' };
  }

  // Pages have no server actions: only the API takes writes (and no page buffers a body).
  if (!path.startsWith('/api/')) {
    return { status: 405, error: 'Pages only answer GET; changes go through the API under /api.' };
  }

  if (path.startsWith('/api/auth/')) {
    // next-auth reads its whole body before looking at it: only short, announced bodies.
    const length = Number(one(headers['content-length']) ?? 'NaN');
    if (one(headers['transfer-encoding']) || !Number.isFinite(length)) {
      if (hasBody(headers)) return { status: 411, error: 'Sign-in forms must announce their length (Content-Length).' };
    } else if (length > AUTH_BODY_MAX) {
      return { status: 413, error: `Sign-in forms are at most ${AUTH_BODY_MAX / 1024} KB.` };
    }
    return null;
  }

  if (m === 'DELETE' && !hasBody(headers)) return null;
  const type = mediaType(headers);
  if (type !== 'application/json' && type !== 'multipart/form-data') {
    return { status: 415, error: 'Send the body as application/json (or multipart/form-data for files).' };
  }
  return null;
}
