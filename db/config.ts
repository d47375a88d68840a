// One place that says where the database is, so the app, scripts and tests agree.
//
// Two roles: DATABASE_URL is the owner of the schema (migrations, seeds, tests, scripts);
// APP_DATABASE_URL is the least-privilege role the serving app connects as (bandcone_app:
// reads and writes rows, never changes the schema; see db/migrations/0005). The start and
// test scripts give APP_DATABASE_URL to the server process only. Without it (npm run dev)
// the app falls back to DATABASE_URL.
//
// DATABASE_REPLICA_URL, when set, is a read-only streaming replica (a hot standby) that serves
// the public catalogue's reads: searches, curve pages, exports (lib/catalogue/read-source.ts).
// Everything else stays on APP_DATABASE_URL.

export function databaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) {
    throw new Error('DATABASE_URL is not set; start the app with ./scripts/start.sh or set it yourself.');
  }
  return url;
}

/** The connection a process uses for its ordinary work: the app role when one is configured. */
export function appDatabaseUrl(): string {
  return process.env.APP_DATABASE_URL || databaseUrl();
}

/** The hot standby catalogue reads may use, or null when there is none. */
export function replicaDatabaseUrl(): string | null {
  return process.env.DATABASE_REPLICA_URL || null;
}
