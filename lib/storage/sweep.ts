import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { STAGE_MAX_AGE_SECONDS } from './uploads';
import { STAGING_PREFIX, list, remove } from './objects';

/**
 * Drops what browsers staged and nobody submitted: stage rows and staging objects older than
 * STAGE_MAX_AGE_SECONDS. Objects are judged by their own age, so a copy whose row is already
 * gone (a crash between commit and clean-up) goes too. Every server runs it on start and then
 * hourly; two sweeps at once delete the same things, which is harmless.
 */
export async function sweepStaging(maxAgeSeconds = STAGE_MAX_AGE_SECONDS, now = Date.now()): Promise<{ rows: number; objects: number }> {
  const rows = await db().sequelize.query<{ id: string }>(
    `DELETE FROM upload_stages WHERE created_at < now() - make_interval(secs => :age) RETURNING id`,
    { replacements: { age: maxAgeSeconds }, type: QueryTypes.SELECT },
  );
  let objects = 0;
  for await (const o of list(STAGING_PREFIX)) {
    if (now - o.lastModified.getTime() > maxAgeSeconds * 1000) {
      await remove(o.key);
      objects++;
    }
  }
  return { rows: rows.length, objects };
}

let timer: NodeJS.Timeout | undefined;

export function startStagingSweeper(everySeconds = 3600): void {
  if (timer) return;
  const run = () => void sweepStaging().catch((err) => console.error('staging sweep:', (err as Error).message ?? err));
  setTimeout(run, 5000).unref();
  timer = setInterval(run, everySeconds * 1000);
  timer.unref();
}
