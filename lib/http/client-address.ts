import { isIP } from 'node:net';

// Who is on the other end of a request, as our own server (server.ts) tells the app.
//
// A client may write any X-Forwarded-For it likes, so the header is never trusted as sent.
// With no proxy in front (TRUSTED_PROXIES unset or 0) the socket's address replaces it.
// With N proxies of ours in front, each appends the address it received the request from,
// so only the right-most N entries were written by machines we trust; the left-most of
// those is the visitor (common practice: the "trusted hops" rule of reverse proxies).

export function trustedProxyCount(raw = process.env.TRUSTED_PROXIES): number {
  const n = Number(raw ?? 0);
  return Number.isInteger(n) && n > 0 && n < 32 ? n : 0;
}

/** An address as a rate-limit key: IPv4-mapped IPv6 unwrapped, lower case. */
export function normaliseAddress(raw: string | undefined | null): string {
  let a = (raw ?? '').trim().toLowerCase();
  if (a.startsWith('[') && a.includes(']')) a = a.slice(1, a.indexOf(']'));
  if (a.startsWith('::ffff:') && isIP(a.slice(7)) === 4) a = a.slice(7);
  return a;
}

export type ForwardedChain = { forwardedFor: string; client: string };

/**
 * The X-Forwarded-For the app should see and the visitor's address, from the socket's address,
 * the header as it arrived and the number of trusted proxies.
 */
export function forwardedChain(socketAddress: string | undefined, header: string | string[] | undefined, trusted: number): ForwardedChain {
  const socket = normaliseAddress(socketAddress) || 'unknown';
  if (trusted <= 0) return { forwardedFor: socket, client: socket };
  const joined = Array.isArray(header) ? header.join(',') : (header ?? '');
  // Split on commas without a regular expression; cap the work at the header's length.
  const entries = joined.split(',').map(normaliseAddress).filter((e) => e.length > 0 && e.length <= 64);
  const kept = entries.slice(-trusted);
  // A request that reached us without passing every proxy: the socket is the best we know.
  if (kept.length === 0) return { forwardedFor: socket, client: socket };
  return { forwardedFor: kept.join(', '), client: kept[0] };
}

/**
 * The key a rate limit counts against: an IPv4 address, or the /64 network of an IPv6 one,
 * since one IPv6 subscriber usually holds a whole /64 (common practice, RFC 6177).
 */
export function addressKey(address: string): string {
  const a = normaliseAddress(address);
  if (isIP(a) !== 6) return a || 'unknown';
  const [head, tail = ''] = a.split('::');
  const h = head ? head.split(':') : [];
  const t = tail ? tail.split(':') : [];
  const groups = a.includes('::') ? [...h, ...Array(Math.max(0, 8 - h.length - t.length)).fill('0'), ...t] : h;
  return `${groups.slice(0, 4).map((g) => parseInt(g, 16).toString(16)).join(':')}::/64`;
}
