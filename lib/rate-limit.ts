import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';

// A sliding window kept in PostgreSQL, so every app server behind a balancer sees the same counts.
export async function hitCount(bucket: string, windowSeconds: number): Promise<number> {
  const { sequelize } = db();
  const rows = await sequelize.query<{ n: string }>(
    `SELECT count(*) AS n FROM rate_limit_hits WHERE bucket = :bucket AND hit_at > now() - make_interval(secs => :windowSeconds)`,
    { replacements: { bucket, windowSeconds }, type: QueryTypes.SELECT },
  );
  return Number(rows[0]?.n ?? 0);
}

export async function recordHit(bucket: string): Promise<void> {
  const { sequelize } = db();
  await sequelize.query('INSERT INTO rate_limit_hits (bucket) VALUES (:bucket)', { replacements: { bucket } });
}

export async function clearHits(bucket: string): Promise<void> {
  const { sequelize } = db();
  await sequelize.query('DELETE FROM rate_limit_hits WHERE bucket = :bucket', { replacements: { bucket } });
}

/** Counts this request and says whether it is over the limit. */
export async function overLimit(bucket: string, limit: number, windowSeconds: number): Promise<boolean> {
  await recordHit(bucket);
  return (await hitCount(bucket, windowSeconds)) > limit;
}

export function clientAddress(headers: Headers | Record<string, string | string[] | undefined>): string {
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  return get('x-forwarded-for')?.split(',')[0]?.trim() || get('x-real-ip') || 'local';
}
