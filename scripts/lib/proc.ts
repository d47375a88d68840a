import { readFileSync, readdirSync, readlinkSync } from 'node:fs';

// Finds a local server's process and reads its memory from /proc (Linux only), so checks and
// tests can watch the server they talk to without it telling them anything.

function listeningInodes(port: number): Set<string> {
  const inodes = new Set<string>();
  const hex = port.toString(16).toUpperCase().padStart(4, '0');
  for (const file of ['/proc/net/tcp', '/proc/net/tcp6']) {
    let text = '';
    try {
      text = readFileSync(file, 'utf8');
    } catch {
      continue;
    }
    for (const line of text.split('\n').slice(1)) {
      const cols = line.trim().split(/\s+/);
      // local_address is "ADDR:PORT"; state 0A is LISTEN.
      if (cols.length > 9 && cols[1].endsWith(`:${hex}`) && cols[3] === '0A') inodes.add(cols[9]);
    }
  }
  return inodes;
}

/** The pid of the process listening on a local TCP port, or null when none can be seen. */
export function pidListeningOn(port: number): number | null {
  const inodes = listeningInodes(port);
  if (inodes.size === 0) return null;
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    let fds: string[];
    try {
      fds = readdirSync(`/proc/${entry}/fd`);
    } catch {
      continue;
    }
    for (const fd of fds) {
      try {
        const link = readlinkSync(`/proc/${entry}/fd/${fd}`);
        if (link.startsWith('socket:[') && inodes.has(link.slice(8, -1))) return Number(entry);
      } catch {
        // the fd closed while we looked
      }
    }
  }
  return null;
}

/** Resident memory of a process in bytes (VmRSS), or null when it cannot be read. */
export function rssBytes(pid: number): number | null {
  try {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8');
    const line = status.split('\n').find((l) => l.startsWith('VmRSS:'));
    return line ? Number(line.split(/\s+/)[1]) * 1024 : null;
  } catch {
    return null;
  }
}

/** Peak resident memory of a process in bytes (VmHWM), or null when it cannot be read. */
export function peakRssBytes(pid: number): number | null {
  try {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8');
    const line = status.split('\n').find((l) => l.startsWith('VmHWM:'));
    return line ? Number(line.split(/\s+/)[1]) * 1024 : null;
  } catch {
    return null;
  }
}
