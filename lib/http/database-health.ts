import pg from 'pg';
import { appDatabaseUrl } from '../../db/config';
import { isDatabaseUnavailable } from './unavailable';

/**
 * Whether PostgreSQL answers, asked at most four times a second and shared by the requests
 * in between. The server asks before drawing a page: a page cannot set its own status once
 * it streams, so while the database is down the server answers 503 itself, in plain words.
 * A page that fails on a lost connection in the moment before the check notices is reported
 * by Next (instrumentation.ts, onRequestError) before its error page is written; the server
 * then sends that page as a 503 too. API routes map a lost connection to 503 themselves
 * (lib/http/unavailable.ts). State lives on globalThis: the server and Next's bundle of
 * instrumentation.ts load this module separately.
 */
const FRESH_MS = 250;
const SUSPECT_MS = 5_000;
const state = globalThis as unknown as { bandconeDbPool?: pg.Pool; bandconeDbProbe?: { at: number; up: Promise<boolean> } | null; bandconeDbFailedAt?: number };

function probe(): Promise<boolean> {
  if (!state.bandconeDbPool) {
    state.bandconeDbPool = new pg.Pool({ connectionString: appDatabaseUrl(), max: 1, connectionTimeoutMillis: 1_500, idleTimeoutMillis: 10_000 });
    // A pool error on an idle client (the server going away) is expected here, not a crash.
    state.bandconeDbPool.on('error', () => undefined);
  }
  return state.bandconeDbPool.query('SELECT 1').then(
    () => true,
    () => false,
  );
}

export function databaseUp(now = Date.now()): Promise<boolean> {
  const last = state.bandconeDbProbe;
  if (!last || now - last.at >= FRESH_MS) state.bandconeDbProbe = { at: now, up: probe() };
  return state.bandconeDbProbe!.up;
}

/** Called for every error a page or route raised: a lost connection makes the next check ask afresh. */
export function noteRequestError(err: unknown): void {
  if (!isDatabaseUnavailable(err)) return;
  state.bandconeDbFailedAt = Date.now();
  state.bandconeDbProbe = null;
}

/** Whether a request failed on a lost database connection in the last few seconds. */
export function databaseRecentlyLost(now = Date.now()): boolean {
  return now - (state.bandconeDbFailedAt ?? -Infinity) < SUSPECT_MS;
}

export const UNAVAILABLE_PAGE = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta http-equiv="refresh" content="5">
<title>Briefly unavailable · Bandcone</title>
<style>body{font-family:system-ui,sans-serif;max-width:32rem;margin:3rem auto;padding:0 1rem;line-height:1.5;color:#1b1e24;background:#fbfaf7}
@media (prefers-color-scheme:dark){body{color:#e8e4dc;background:#121316}}</style></head>
<body><h1>The library is briefly unavailable</h1>
<p>Bandcone cannot reach its database just now, usually because it is restarting. Nothing you saved is lost.</p>
<p>This page tries again by itself every few seconds.</p></body></html>`;
