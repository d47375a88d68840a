/**
 * Hostile file shapes for the curve reader, and a child-process runner that
 * reads one of them and prints its time and memory growth. Each shape runs in
 * a fresh process so one shape's peak memory does not hide the next one's.
 * Used by `npm run bench:engine`; run alone with
 * `npx tsx scripts/bench-reader-hostile.ts <shape> <bytes>`.
 */

import { performance } from 'node:perf_hooks';
import { readCurveText } from '../lib/engine/reader';

function repeatTo(unit: string, bytes: number, head = '', tail = ''): string {
  const room = Math.max(0, bytes - head.length - tail.length);
  return head + unit.repeat(Math.floor(room / unit.length)) + tail;
}

const ROWS = '\n650;0,1\n652;0,5\n654;0,9\n656;0,5\n658;0,1\n';

/** Each shape fills about `bytes` bytes. */
export const SHAPES: Record<string, (bytes: number) => string | Uint8Array> = {
  'one long digit run, then rows': (b) => repeatTo('1', b - 1, '', `x${ROWS}`),
  'a digit run inside a data row': (b) => repeatTo('1', b, 'wl;t\n650;0,1\n652;', `,5x${ROWS}`),
  'many columns (20 000 per row)': (b) => {
    const row = Array.from({ length: 20_000 }, (_, i) => String(i + 1)).join(',') + '\n';
    return repeatTo(row, b);
  },
  'many quoted columns, a comma inside one': (b) => {
    const row = '"1,5",' + Array.from({ length: 5_000 }, (_, i) => `"${i}"`).join(',') + '\n';
    return repeatTo(row, b);
  },
  'long lines of words (100 kB each)': (b) => repeatTo(repeatTo('lorem 1 ', 100_000) + '\n', b),
  'a long run of spaces in a row': (b) => repeatTo(' ', b, '650', 'x\n652 0.5\n'),
  'many tiny rows': (b) => repeatTo('1,2\n', b),
  'blank lines only': (b) => repeatTo('\n', b),
  'comment lines only': (b) => repeatTo('# 650,0.5\n', b),
  'an unclosed quote over the whole file': (b) => repeatTo(',', b, '650,"'),
  'JCAMP-DX: compressed rows, valid': (b) => repeatTo('650A00J00K00L00M00N00O00P00Q00R00\n', b, '##TITLE= x\n##XUNITS= NANOMETERS\n##YUNITS= TRANSMITTANCE\n##YFACTOR= 0.00001\n##XYDATA= (X++(Y..Y))\n', '##END=\n'),
  'JCAMP-DX: (X,Y) pairs without ++': (b) => repeatTo('650.5, 0.5; 651.5, 0.5\n', b, '##TITLE= x\n##XYPOINTS= (XY..XY)\n', '##END=\n'),
  'JCAMP-DX: one long label line': (b) => repeatTo('A', b, '##TITLE= '),
  'NUL at the end': (b) => {
    const t = new TextEncoder().encode(repeatTo('650.1,0.5\n', b - 1));
    const out = new Uint8Array(t.length + 1);
    out.set(t);
    return out;
  },
  'UTF-16 with a BOM': (b) => {
    const text = repeatTo('650.1,0.5\n', (b - 2) / 2);
    const out = new Uint8Array(2 + text.length * 2);
    out[0] = 0xff;
    out[1] = 0xfe;
    for (let i = 0; i < text.length; i++) out[2 + 2 * i] = text.charCodeAt(i);
    return out;
  },
};

export interface HostileFigure {
  shape: string;
  bytes: number;
  outcome: string;
  wallMs: number;
  cpuMs: number;
  peakRssGrowthMb: number;
  heapGrowthMb: number;
}

function runOne(shape: string, bytes: number): HostileFigure {
  const input = SHAPES[shape](bytes);
  const file = typeof input === 'string' ? new TextEncoder().encode(input) : input;
  globalThis.gc?.();
  const rss0 = process.memoryUsage().rss;
  const heap0 = process.memoryUsage().heapUsed;
  let peakHeap = heap0;
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let outcome: string;
  try {
    const r = readCurveText(file);
    outcome = `read ${r.rowCount} rows`;
  } catch (e) {
    const err = e as { status?: number; message: string };
    outcome = `refused ${err.status ?? '?'}: ${err.message.slice(0, 90)}`;
  }
  const wallMs = performance.now() - t0;
  const c = process.cpuUsage(c0);
  peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed);
  const peakRss = process.resourceUsage().maxRSS * 1024;
  return {
    shape,
    bytes: file.length,
    outcome,
    wallMs: Number(wallMs.toFixed(1)),
    cpuMs: Number(((c.user + c.system) / 1000).toFixed(1)),
    peakRssGrowthMb: Number((Math.max(0, peakRss - rss0) / 1048576).toFixed(1)),
    heapGrowthMb: Number(((peakHeap - heap0) / 1048576).toFixed(1)),
  };
}

if (process.argv[1]?.endsWith('bench-reader-hostile.ts') && process.argv[2]) {
  console.log(JSON.stringify(runOne(process.argv[2], Number(process.argv[3] ?? 1048576))));
}
