// What the load scripts share: percentiles, the server's processes and their memory (through
// lib/proc.ts), and the part of autocannon's API they use (it ships no types).
import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { pidListeningOn, rssBytes } from './lib/proc';

export type AutocannonInstance = PromiseLike<{ errors: number; timeouts: number; non2xx: number }> & {
  on(event: 'response', fn: (client: unknown, status: number, bytes: number, ms: number) => void): void;
};
export type AutocannonRequest = {
  method: string;
  path: string;
  body?: string;
  headers?: Record<string, string>;
  setupRequest?: (req: { path: string; body?: string }) => { path: string; body?: string };
};
export type Autocannon = (opts: {
  url: string;
  connections: number;
  duration: number;
  requests: AutocannonRequest[];
  headers: Record<string, string>;
  overallRate?: number;
  timeout?: number;
}) => AutocannonInstance;
export const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

/** The process listening on the server's port (or the given pid), and its children, if any. */
export function serverPids(base: string, givenPid = ''): number[] {
  const port = Number(new URL(base).port || 80);
  const root = givenPid ? Number(givenPid) : pidListeningOn(port);
  if (root === null || !Number.isFinite(root)) return [];
  const pids = [root];
  const parents = new Map<number, number>();
  for (const d of readdirSync('/proc')) {
    const pid = Number(d);
    if (!Number.isInteger(pid)) continue;
    try {
      const stat = readFileSync(`/proc/${d}/stat`, 'utf8');
      parents.set(pid, Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]));
    } catch {
      /* gone */
    }
  }
  for (let grew = true; grew; ) {
    grew = false;
    for (const [pid, ppid] of parents) if (pids.includes(ppid) && !pids.includes(pid)) (pids.push(pid), (grew = true));
  }
  return pids;
}

export function rssMb(pids: number[]): number {
  return pids.reduce((sum, pid) => sum + (rssBytes(pid) ?? 0), 0) / 1048576;
}

/** Samples the server's memory until stopped; `peak()` is the largest seen. */
export function memorySampler(pids: number[], everyMs = 250) {
  let peak = rssMb(pids);
  const start = peak;
  const timer = setInterval(() => (peak = Math.max(peak, rssMb(pids))), everyMs);
  return { start, peak: () => peak, stop: () => (clearInterval(timer), (peak = Math.max(peak, rssMb(pids))), peak) };
}
