/**
 * Which database answers a catalogue read: the streaming replica (DATABASE_REPLICA_URL) when
 * there is one and it answers, else the primary. Searches, curve pages and exports run their
 * reads through readCatalogue(); sign-in, sessions, tokens, rate limits, a user's own
 * submissions and every write never do, so they stay on the primary.
 *
 * - A caller who wrote in the last few seconds reads the primary (lib/http/read-primary.ts).
 * - The replica is dropped at its first lost connection: that read runs again on the primary at
 *   once, later reads go to the primary, and a probe every REPLICA_RETRY_MS asks the replica
 *   (`SELECT 1`, with the pool's one-second connect timeout) until it answers; then reads return
 *   to it. No request waits on a replica that is down beyond that one failed attempt.
 * - A statement the standby cancels to replay the primary's changes (a recovery conflict) runs
 *   again on the primary.
 */

import type { Sequelize } from 'sequelize';
import { getReplicaSequelize } from '@/db/connection';
import { onReplica, readingReplica } from '@/db/models';
import { isDatabaseUnavailable } from '@/lib/http/unavailable';
import { READ_PRIMARY_HEADER } from '@/lib/http/read-primary';

const REPLICA_RETRY_MS = () => Number(process.env.DB_REPLICA_RETRY_MS ?? 2_000);

type Health = { down: boolean; since: number };
const shared = globalThis as unknown as { bandconeReplicaHealth?: Health };
const health = (shared.bandconeReplicaHealth ??= { down: false, since: 0 });

function markDown(replica: Sequelize, err: unknown) {
  if (health.down) return;
  health.down = true;
  health.since = Date.now();
  console.warn(`[bandcone] the read replica is unreachable (${(err as Error)?.message ?? err}); catalogue reads go to the primary until it answers`);
  const probe = () => {
    const timer = setTimeout(() => {
      replica.query('SELECT 1').then(
        () => {
          health.down = false;
          console.warn(`[bandcone] the read replica answers again after ${((Date.now() - health.since) / 1000).toFixed(1)} s; catalogue reads return to it`);
        },
        () => probe(),
      );
    }, REPLICA_RETRY_MS());
    timer.unref?.();
  };
  probe();
}

/** PostgreSQL cancelled a standby's statement to replay the primary's changes (SQLSTATE 40001, or 40P01 for a lock). */
function recoveryConflict(err: unknown): boolean {
  const e = err as { parent?: { code?: string; message?: string }; original?: { code?: string; message?: string } } | null;
  const original = e?.parent ?? e?.original;
  return !!original && (original.code === '40001' || original.code === '40P01') && (original.message ?? '').includes('conflict with recovery');
}

/** Whether this request asked for the primary (its caller wrote a moment ago). Outside a request: no. */
async function askedForPrimary(): Promise<boolean> {
  try {
    const { headers } = await import('next/headers');
    return (await headers()).get(READ_PRIMARY_HEADER) === '1';
  } catch {
    return false;
  }
}

/** The replica's connection when this read may use it now, else null (the primary answers). */
async function usableReplica(): Promise<Sequelize | null> {
  const replica = getReplicaSequelize();
  if (!replica || health.down || (await askedForPrimary())) return null;
  return replica;
}

/** Runs a catalogue read on the replica when it may, else (or when the replica fails it) on the primary. */
export async function readCatalogue<T>(read: () => Promise<T>): Promise<T> {
  if (readingReplica()) return read();
  const replica = await usableReplica();
  if (!replica) return read();
  try {
    return await onReplica(replica, read);
  } catch (err) {
    const lost = isDatabaseUnavailable(err);
    if (!lost && !recoveryConflict(err)) throw err;
    if (lost) markDown(replica, err);
    return read();
  }
}

/**
 * Whether a search on this request may use the in-process catalogue copy. The copy is read
 * from the replica whenever one serves (memory-index.ts reads through db(), which onReplica
 * points there), so it never mixes the two databases' states; a request kept on the primary
 * (a fresh write of its caller) searches in SQL there instead, at the primary's state.
 */
export function copyServes(): boolean {
  return readingReplica() || getReplicaSequelize() === null || health.down;
}
