import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { db } from '@/db/models';
import { addressKey, normaliseAddress } from '@/lib/http/client-address';

// Fixed-window counters in PostgreSQL (rate-limiter-flexible), so every app server behind a
// balancer sees the same counts. The table is made by migration 0007; expired rows are pruned
// by the library an hour after their window ends.
const TABLE = 'rate_limits';
const PREFIX = 'rl';
const limiters = new Map<string, RateLimiterPostgres>();

function limiter(points: number, windowSeconds: number): RateLimiterPostgres {
  const id = `${points}/${windowSeconds}`;
  let l = limiters.get(id);
  if (!l) {
    l = new RateLimiterPostgres({
      storeClient: db().sequelize,
      storeType: 'sequelize',
      tableName: TABLE,
      tableCreated: true,
      keyPrefix: PREFIX,
      points,
      duration: windowSeconds,
    });
    limiters.set(id, l);
  }
  return l;
}

/** Counts this request and says whether it is over the limit. */
export async function overLimit(bucket: string, limit: number, windowSeconds: number): Promise<boolean> {
  try {
    await limiter(limit, windowSeconds).consume(bucket);
    return false;
  } catch (err) {
    if (err instanceof RateLimiterRes) return true;
    throw err;
  }
}

/** Hits counted against a bucket in its current window. */
export async function hitCount(bucket: string, windowSeconds: number): Promise<number> {
  const res = await limiter(1, windowSeconds).get(bucket);
  return res?.consumedPoints ?? 0;
}

/** Counts one hit without asking about a limit (e.g. a failed password), in a window of `windowSeconds`. */
export async function recordHit(bucket: string, windowSeconds = 15 * 60): Promise<void> {
  await limiter(1, windowSeconds).penalty(bucket, 1);
}

export async function clearHits(bucket: string): Promise<void> {
  await limiter(1, 60).delete(bucket);
}

/**
 * The rate-limit key for the caller. Our server (server.ts) has already replaced the
 * forwarding headers with the address it can vouch for (lib/http/client-address.ts).
 */
export function clientAddress(headers: Headers | Record<string, string | string[] | undefined>): string {
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  const first = get('x-forwarded-for')?.split(',')[0];
  const address = normaliseAddress(get('x-real-ip') || first);
  return address ? addressKey(address) : 'local';
}
