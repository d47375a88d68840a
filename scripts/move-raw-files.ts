// Moves raw files still kept in the database (before migration 0012) to the file store.
// start.sh and test.sh run it after the migrations; `npm run storage:move-raw` runs it by hand.
import { closeSequelize, getOwnerSequelize } from '@/db/connection';
import { storageConfig } from '@/lib/storage/config';
import { isStorageUnavailable } from '@/lib/storage/errors';
import { moveRawFilesToStore } from '@/lib/storage/move';

try {
  const r = await moveRawFilesToStore(getOwnerSequelize());
  console.log(`raw files moved to the file store: ${r.moved} stored, ${r.alreadyThere} already there, ${r.refused.length} left in the database`);
  for (const f of r.refused) console.log(`  file ${f.id}: ${f.reason}`);
  process.exitCode = r.refused.length ? 1 : 0;
} catch (err) {
  if (!isStorageUnavailable(err)) throw err;
  const c = storageConfig();
  console.error(`cannot reach the file store at ${c.endpoint} (bucket ${c.bucket}): raw files still in the database stay there and are served from there; run \`npm run storage:move-raw\` once it is up.`);
  process.exitCode = 2;
} finally {
  await closeSequelize();
}
