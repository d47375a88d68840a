import pg from 'pg';
import { appDatabaseUrl } from '../../db/config';

/**
 * Whether PostgreSQL answers, asked at most once a second and shared by every request in
 * that second. The server asks before drawing a page: a page cannot set its own status once
 * it streams, so while the database is down the server answers 503 itself, in plain words.
 * API routes need no such check: each maps a lost connection to 503 (lib/http/unavailable.ts).
 */
const FRESH_MS = 1_000;
let pool: pg.Pool | null = null;
let last: { at: number; up: Promise<boolean> } | null = null;

function probe(): Promise<boolean> {
  pool ??= new pg.Pool({ connectionString: appDatabaseUrl(), max: 1, connectionTimeoutMillis: 1_500, idleTimeoutMillis: 10_000 });
  // A pool error on an idle client (the server going away) is expected here, not a crash.
  pool.removeAllListeners('error');
  pool.on('error', () => undefined);
  return pool.query('SELECT 1').then(
    () => true,
    () => false,
  );
}

export function databaseUp(now = Date.now()): Promise<boolean> {
  if (!last || now - last.at >= FRESH_MS) last = { at: now, up: probe() };
  return last.up;
}

export const UNAVAILABLE_PAGE = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta http-equiv="refresh" content="5">
<title>Briefly unavailable · Bandcone</title>
<style>body{font-family:system-ui,sans-serif;max-width:32rem;margin:3rem auto;padding:0 1rem;line-height:1.5;color:#1b1e24;background:#fbfaf7}
@media (prefers-color-scheme:dark){body{color:#e8e4dc;background:#121316}}</style></head>
<body><h1>The library is briefly unavailable</h1>
<p>Bandcone cannot reach its database just now, usually because it is restarting. Nothing you saved is lost.</p>
<p>This page tries again by itself every few seconds.</p></body></html>`;
