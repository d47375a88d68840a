import { getOwnerSequelize, closeSequelize } from './connection';
import { createMigrator } from './migrator';

async function main() {
  const direction = process.argv[2] ?? 'up';
  const migrator = createMigrator(getOwnerSequelize());
  if (direction === 'down') {
    const done = await migrator.down();
    console.log(`reverted: ${done.map((m) => m.name).join(', ') || 'nothing'}`);
  } else {
    const done = await migrator.up();
    console.log(`migrated: ${done.map((m) => m.name).join(', ') || 'already up to date'}`);
  }
  await closeSequelize();
}

main().catch(async (err) => {
  console.error(err);
  await closeSequelize();
  process.exit(1);
});
