// Bandcone's HTTP server: Node's `http` in front of Next's request handler, so that what only
// the socket knows (who is connecting) and what must hold for every route (where a write comes
// from, what it carries) is settled before any page or route handler runs.
//
//   node --import tsx server.ts [-H 127.0.0.1] [-p 3000] [--dev]
//   node .next/bandcone-server/server.mjs [-H …] [-p …]   (the same, bundled by `npm run build`; what the scripts serve)
//
// PORT and HOST are read from the environment when the flags are absent. TRUSTED_PROXIES=N
// says N reverse proxies of ours stand in front (lib/http/client-address.ts). WEB_CONCURRENCY=N
// (default 1) serves from N processes sharing the port (Node's cluster, round-robin): a page is
// CPU-bound work in one JavaScript thread, so one process uses one core however many there are.
// Each process keeps its own catalogue copy; only the first sends mail.
import cluster from 'node:cluster';
import { existsSync } from 'node:fs';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { forwardedChain, trustedProxyCount } from './lib/http/client-address';
import { guardRequest } from './lib/http/request-guard';
import type * as DatabaseHealth from './lib/http/database-health';
import { DEFAULT_FITNESS_CACHE_MB } from './lib/catalogue/cache-budget';
import { settleReadSource } from './lib/http/read-primary';

function flag(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

const dev = process.argv.includes('--dev');
const hostname = flag('-H') ?? process.env.HOST ?? '127.0.0.1';
const port = Number(flag('-p') ?? process.env.PORT ?? 3000);
const trusted = trustedProxyCount();
// The project's folder: this file's, or the one above the build folder when running as the bundle.
const here = path.dirname(fileURLToPath(import.meta.url));
const dir = [here, path.dirname(here), path.dirname(path.dirname(here))].find((d) => existsSync(path.join(d, 'next.config.ts'))) ?? here;

// The database's health and the Retry-After we send, loaded by a serving process only (main): they
// bring pg and Sequelize, which a supervising process has no use for (about 40 MB of its memory).
let health: typeof DatabaseHealth;
let RETRY_AFTER_SECONDS: number;

// Headers only a proxy we trust may set; from anyone else they are lies about the request.
const PROXY_HEADERS = ['x-forwarded-host', 'x-forwarded-proto', 'x-forwarded-port', 'forwarded'];

/** Rewrites the client-address headers from what the socket (and trusted proxies) say. */
function settleAddress(req: IncomingMessage) {
  const chain = forwardedChain(req.socket.remoteAddress, req.headers['x-forwarded-for'], trusted);
  req.headers['x-forwarded-for'] = chain.forwardedFor;
  req.headers['x-real-ip'] = chain.client;
  if (trusted === 0) for (const h of PROXY_HEADERS) delete req.headers[h];
}

function refuse(res: ServerResponse, status: number, error: string) {
  const body = JSON.stringify({ error, details: [] });
  res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(body), 'cache-control': 'no-store', 'x-content-type-options': 'nosniff', connection: 'close' });
  res.end(body);
}

/** A page whose drawing failed on a lost database connection goes out as 503 with Retry-After (its body is the error page). */
function answerLostDatabaseAs503(res: ServerResponse) {
  const fix = (status: number) => {
    if (status !== 500 || res.headersSent || !health.databaseRecentlyLost()) return status;
    res.setHeader('retry-after', String(RETRY_AFTER_SECONDS));
    return 503;
  };
  const writeHead = res.writeHead.bind(res) as (...args: unknown[]) => ServerResponse;
  res.writeHead = ((status: number, ...rest: unknown[]) => writeHead(fix(status), ...rest)) as typeof res.writeHead;
  for (const name of ['write', 'end'] as const) {
    const original = res[name].bind(res) as (...args: unknown[]) => unknown;
    (res as unknown as Record<string, unknown>)[name] = (...args: unknown[]) => {
      if (!res.headersSent) res.statusCode = fix(res.statusCode);
      return original(...args);
    };
  }
}

async function main() {
  // Imported here so that a supervising process (WEB_CONCURRENCY > 1) never loads Next at all.
  const { default: next } = await import('next');
  health = await import('./lib/http/database-health');
  ({ RETRY_AFTER_SECONDS } = await import('./lib/http/unavailable'));
  const app = next({ dev, dir, hostname, port });
  const handle = app.getRequestHandler();
  await app.prepare();

  const server = createServer((req, res) => {
    settleAddress(req);
    const refusal = guardRequest({ method: req.method ?? 'GET', path: req.url ?? '/', headers: req.headers });
    if (refusal) {
      // Drain nothing: the connection closes with the answer.
      refuse(res, refusal.status, refusal.error);
      return;
    }
    void serve(req, res);
  });
  const serve = async (req: IncomingMessage, res: ServerResponse) => {
    // A page read while the database is down: a plain 503 that retries, instead of a broken page.
    const url = req.url ?? '/';
    if ((req.method === 'GET' || req.method === 'HEAD') && !url.startsWith('/api/') && !url.startsWith('/_next/') && !(await health.databaseUp())) {
      res.writeHead(503, {
        'content-type': 'text/html; charset=utf-8', 'retry-after': String(RETRY_AFTER_SECONDS), 'cache-control': 'no-store',
        'content-security-policy': "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'", 'x-content-type-options': 'nosniff',
      });
      res.end(req.method === 'HEAD' ? undefined : health.UNAVAILABLE_PAGE);
      return;
    }
    if (!url.startsWith('/api/') && !url.startsWith('/_next/')) answerLostDatabaseAs503(res);
    // a caller's reads just after their own write stay on the primary (read-primary.ts)
    if (!url.startsWith('/_next/')) settleReadSource(req, res);
    handle(req, res).catch((err: unknown) => {
      console.error(err);
      if (!res.headersSent) refuse(res, 500, 'Something went wrong on our side; nothing was saved.');
      else res.destroy();
    });
  };
  // A request must arrive whole within five minutes and its headers within one (slow-send attacks).
  server.requestTimeout = 5 * 60_000;
  server.headersTimeout = 60_000;
  server.listen(port, hostname, () => {
    console.log(`Bandcone listening on http://${hostname}:${port} (${dev ? 'development' : 'production'}; trusted proxies: ${trusted})`);
  });

  const stop = () => {
    server.close(() => process.exit(0));
    server.closeAllConnections();
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

/** Forks `count` serving processes and replaces any that dies, until told to stop. */
function supervise(count: number) {
  let stopping = false;
  const fork = (index: number) => {
    const worker = cluster.fork({
      BANDCONE_WORKER_INDEX: String(index),
      // The fitness blocks' memory budget is shared out, so N copies together keep to one budget.
      BANDCONE_FITNESS_CACHE_MB: process.env.BANDCONE_FITNESS_CACHE_MB ?? String(Math.floor(DEFAULT_FITNESS_CACHE_MB / count)),
      ...(index > 0 ? { MAIL_WORKER: '0' } : {}),
    });
    worker.on('exit', (code, signal) => {
      if (stopping) return;
      console.error(`serving process ${index} ended (${signal ?? code}); starting another`);
      setTimeout(() => fork(index), 1000);
    });
  };
  for (let i = 0; i < count; i++) fork(i);
  const stop = () => {
    stopping = true;
    for (const w of Object.values(cluster.workers ?? {})) w?.process.kill('SIGTERM');
    const done = () => (Object.keys(cluster.workers ?? {}).length === 0 ? process.exit(0) : setTimeout(done, 100));
    done();
    setTimeout(() => process.exit(0), 7000).unref();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

const concurrency = Math.max(1, Math.min(16, Math.floor(Number(process.env.WEB_CONCURRENCY ?? 1)) || 1));
if (cluster.isPrimary && concurrency > 1 && !dev) {
  console.log(`Bandcone serving from ${concurrency} processes`);
  supervise(concurrency);
} else {
  main().catch((err: unknown) => {
    console.error(err);
    process.exit(1);
  });
}
