import { createHash } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { sessionCookieValue } from './request-guard';

/**
 * Read-your-own-writes with a lagging replica. Catalogue reads may go to a streaming replica
 * (lib/catalogue/read-source.ts), which can be a moment behind the primary; someone who has just
 * written (submitted, verified, revised) must see their write. So, for READ_PRIMARY_SECONDS after
 * a write that succeeded, that caller's catalogue reads stay on the primary. Two marks, settled
 * by our server (server.ts) before Next sees the request:
 * - a short-lived cookie on the write's answer (a browser, whichever app server it reaches next);
 * - the caller's credential (API token or session cookie, hashed) remembered by this process,
 *   for clients that keep no cookies.
 * Either one sets READ_PRIMARY_HEADER on the request; a client's own copy of it is removed.
 */
export const READ_PRIMARY_HEADER = 'x-bandcone-read-primary';
export const WROTE_COOKIE = 'bandcone-wrote';
const READ_PRIMARY_SECONDS = () => Math.max(1, Number(process.env.READ_PRIMARY_AFTER_WRITE_SECONDS ?? 5));
const MAX_REMEMBERED = 10_000;
const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

const shared = globalThis as unknown as { bandconeRecentWriters?: Map<string, number> };
const recent = (shared.bandconeRecentWriters ??= new Map<string, number>());

function one(v: string | string[] | undefined): string | undefined {
  return Array.isArray(v) ? v[0] : v;
}

/** Who is writing, as a hash of the credential the request carries (null for an anonymous one). */
function writerKey(req: IncomingMessage): string | null {
  const auth = one(req.headers.authorization);
  const credential = auth?.startsWith('Bearer ') ? auth : sessionCookieValue(one(req.headers.cookie));
  return credential ? createHash('sha256').update(credential).digest('base64url') : null;
}

function hasWroteCookie(cookieHeader: string | undefined): boolean {
  return !!cookieHeader && cookieHeader.split(';').some((part) => part.slice(0, part.indexOf('=') >>> 0).trim() === WROTE_COOKIE);
}

function remember(key: string, now: number) {
  recent.delete(key);
  recent.set(key, now);
  const horizon = now - READ_PRIMARY_SECONDS() * 1000;
  // insertion order is time order: the oldest go first
  for (const [k, at] of recent) {
    if (at >= horizon && recent.size <= MAX_REMEMBERED) break;
    recent.delete(k);
  }
}

/**
 * Called by the server for every request before Next handles it: marks a read that must see
 * the caller's recent write, and arranges for a write that succeeds to mark what follows.
 */
export function settleReadSource(req: IncomingMessage, res: ServerResponse, now = Date.now()): void {
  delete req.headers[READ_PRIMARY_HEADER];
  const key = writerKey(req);
  const at = key ? recent.get(key) : undefined;
  if (hasWroteCookie(one(req.headers.cookie)) || (at !== undefined && now - at < READ_PRIMARY_SECONDS() * 1000)) {
    req.headers[READ_PRIMARY_HEADER] = '1';
  }
  // only a signed-in caller's write can change what the catalogue shows them (an anonymous POST
  // is a preview or a model call), so only theirs marks what follows
  if (!key || !WRITES.has(req.method ?? 'GET')) return;
  const cookie = `${WROTE_COOKIE}=1; Max-Age=${READ_PRIMARY_SECONDS()}; Path=/; HttpOnly; SameSite=Lax`;
  const writeHead = res.writeHead.bind(res) as (...args: unknown[]) => ServerResponse;
  res.writeHead = ((status: number, ...rest: unknown[]) => {
    if (status < 400 && !res.headersSent) {
      remember(key, Date.now());
      // added to what the app set (headers given to writeHead itself take precedence, as Node merges them)
      const prior = res.getHeader('set-cookie');
      const list = prior === undefined ? [] : Array.isArray(prior) ? prior.map(String) : [String(prior)];
      res.setHeader('set-cookie', [...list, cookie]);
    }
    return writeHead(status, ...rest);
  }) as typeof res.writeHead;
}
