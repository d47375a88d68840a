/**
 * A compact in-process copy of what a fitness search over the public catalogue
 * reads: each verified curve's filter columns, and, loaded on first use, the
 * fitness grid of one (line, level) at a time. PostgreSQL stays the source of
 * truth: every search first reads `catalogue_version` (bumped at the commit of
 * any change to curves or their grid rows, migration 0003) and drops the copy
 * when it has moved, and every load reads the version in the same statement as
 * the rows, so a copy never mixes two states of the library.
 *
 * Why: τ for every curve of a line is a short dot product per curve (see
 * fitness-grid.ts). PostgreSQL spends about 1 µs per array subscript on it,
 * 40–100 ms for the 40 000 Hα curves of a 100 000-curve library; the same sum
 * over typed arrays takes a few milliseconds.
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { INSTRUMENTS, LINE_IDS } from '@/lib/schemas/submission';
import { FINE_INTERVALS, INTERVALS, LEVEL_STEPS } from './fitness-grid';
import { FWHM_BUCKETS } from './search-params';

/** Interval means of one level of one frame, per row (running sums differenced: they fit 16 bits, see SCALE/quantise). */
export interface GridBlock {
  /** Row of each snapshot curve in this block, or -1. */
  rowOf: Int32Array;
  /** Snapshot curve of each row. */
  members: Int32Array;
  direct: Uint16Array;
  /** Row offset into `canonical` (in rows), or -1 when the curve keeps no canonical frame. */
  canonRow: Int32Array;
  canonical: Uint16Array;
  nEffDefault: Float64Array;
  bytes: number;
}

/** Running sums of the fine level (off-normal curves), per row. */
export interface FineBlock {
  rowOf: Int32Array;
  sums: Int32Array;
  bytes: number;
}

export interface Snapshot {
  version: string;
  n: number;
  ids: Int32Array;
  cwl: Float64Array;
  fwhm: Float64Array;
  peak: Float64Array;
  aoi: Float64Array;
  /** Microseconds since the epoch (PostgreSQL's resolution), NaN when unset. */
  verifiedAt: Float64Array;
  instrument: Uint8Array;
  contributor: Int32Array;
  contributors: string[];
  /** Index into `lineSets` (curves sharing the same target lines share one array). */
  lineSet: Int32Array;
  lineSets: string[][];
  /** Index of each curve's first line in LINE_IDS, or -1. */
  firstLine: Int8Array;
  /** Bit k set when the curve targets LINE_IDS[k]. */
  lineMask: Int32Array;
  /** 1 + PostgreSQL's width_bucket over the FWHM facet's edges, 0 when the FWHM is unknown. */
  fwhmBucket: Uint8Array;
  blocks: Map<string, Promise<GridBlock>>;
  fine: Map<string, Promise<FineBlock>>;
  /** Blocks in order of last use, for the memory budget. */
  used: Map<string, number>;
}

/** Thrown when the library changed while a block was loading; the search starts over on a fresh copy. */
export class StaleCopy extends Error {
  constructor() {
    super('the catalogue changed while it was being read');
  }
}

const BUDGET_BYTES = Number(process.env.BANDCONE_FITNESS_CACHE_MB ?? 160) * 1024 * 1024;

const state = globalThis as unknown as { bandconeCatalogueCopy?: Promise<Snapshot> };

const EDGES = FWHM_BUCKETS.slice(1).map(([a]) => a);

/** PostgreSQL's width_bucket(x, edges): how many edges are ≤ x. */
export function widthBucket(x: number): number {
  let k = 0;
  while (k < EDGES.length && EDGES[k] <= x) k++;
  return k;
}

const split = (s: string | null): string[] => (s ? s.split(',') : []);
const num = (s: string): number => (s === '' ? NaN : Number(s));

export async function currentVersion(): Promise<string> {
  const rows = await db().sequelize.query<{ v: string }>(`SELECT version::text AS v FROM catalogue_version`, { type: QueryTypes.SELECT });
  return rows[0]?.v ?? '0';
}

async function loadSnapshot(): Promise<Snapshot> {
  // one statement, so the version and the rows are of the same moment; the columns are all in the
  // covering indexes (an index-only scan) and come back as comma-joined text, which splits several
  // times faster than the driver parses 100 000 rows; they are put in id order here
  const [r] = await db().sequelize.query<Record<string, string | null>>(
    `SELECT (SELECT version::text FROM catalogue_version) AS v,
            string_agg(id::text, ',') AS ids,
            string_agg(coalesce(cwl_nm::text, ''), ',') AS cwl,
            string_agg(coalesce(fwhm_nm::text, ''), ',') AS fwhm,
            string_agg(peak_t::text, ',') AS peak,
            string_agg(aoi_deg::text, ',') AS aoi,
            string_agg(coalesce((extract(epoch FROM verified_at) * 1000000)::bigint::text, ''), ',') AS verified,
            string_agg(instrument, ',') AS instrument,
            string_agg(contributor_id::text, ',') AS contributor,
            string_agg(array_to_string(lines, ' '), ',') AS lines
     FROM curves WHERE status = 'verified'`,
    { type: QueryTypes.SELECT },
  );
  const raw = split(r.ids).map(Number);
  const n = raw.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => raw[a] - raw[b]);
  const numbers = (text: string | null) => {
    const parts = split(text);
    return Float64Array.from(order, (k) => num(parts[k]));
  };
  const texts = (text: string | null) => {
    const parts = split(text);
    return order.map((k) => parts[k]);
  };
  const s: Snapshot = {
    version: r.v ?? '0',
    n,
    ids: Int32Array.from(order, (k) => raw[k]),
    cwl: numbers(r.cwl),
    fwhm: numbers(r.fwhm),
    peak: numbers(r.peak),
    aoi: numbers(r.aoi),
    verifiedAt: numbers(r.verified),
    instrument: new Uint8Array(n),
    contributor: new Int32Array(n),
    contributors: [],
    lineSet: new Int32Array(n),
    lineSets: [],
    firstLine: new Int8Array(n),
    lineMask: new Int32Array(n),
    fwhmBucket: new Uint8Array(n),
    blocks: new Map(),
    fine: new Map(),
    used: new Map(),
  };
  const instruments = texts(r.instrument);
  const contributors = texts(r.contributor);
  const lines = texts(r.lines);
  const who = new Map<string, number>();
  const sets = new Map<string, number>();
  for (let i = 0; i < n; i++) {
    s.instrument[i] = Math.max(0, (INSTRUMENTS as readonly string[]).indexOf(instruments[i]));
    let c = who.get(contributors[i]);
    if (c === undefined) who.set(contributors[i], (c = s.contributors.push(contributors[i]) - 1));
    s.contributor[i] = c;
    let l = sets.get(lines[i]);
    if (l === undefined) sets.set(lines[i], (l = s.lineSets.push(lines[i] ? lines[i].split(' ') : []) - 1));
    s.lineSet[i] = l;
    s.firstLine[i] = (LINE_IDS as readonly string[]).indexOf(s.lineSets[l][0] ?? '');
    for (const id of s.lineSets[l]) {
      const k = (LINE_IDS as readonly string[]).indexOf(id);
      if (k >= 0) s.lineMask[i] |= 1 << k;
    }
    s.fwhmBucket[i] = Number.isNaN(s.fwhm[i]) ? 0 : widthBucket(s.fwhm[i]) + 1;
  }
  return s;
}

/** The copy for the library as it is now (one read of catalogue_version when nothing changed). */
export async function catalogueCopy(): Promise<Snapshot> {
  const version = await currentVersion();
  const held = state.bandconeCatalogueCopy;
  if (held) {
    const s = await held.catch(() => null);
    if (s && s.version === version) return s;
    // a load already under way for this version is shared
    if (state.bandconeCatalogueCopy !== held) return catalogueCopy();
  }
  const loading = loadSnapshot();
  state.bandconeCatalogueCopy = loading;
  loading.catch(() => {
    if (state.bandconeCatalogueCopy === loading) state.bandconeCatalogueCopy = undefined;
  });
  return loading;
}

/** Forgets the copy (tests; and a search that met a StaleCopy). */
export function dropCatalogueCopy(): void {
  state.bandconeCatalogueCopy = undefined;
}

function touch(s: Snapshot, key: string, bytes: number) {
  s.used.delete(key);
  s.used.set(key, bytes);
  let total = 0;
  for (const b of s.used.values()) total += b;
  for (const k of s.used.keys()) {
    if (total <= BUDGET_BYTES || k === key) break;
    total -= s.used.get(k)!;
    s.used.delete(k);
    s.blocks.delete(k);
    s.fine.delete(k);
  }
}

function rowIndex(s: Snapshot): (id: number) => number {
  // ids are sorted: binary search instead of a 100 000-entry Map
  return (id) => {
    let lo = 0;
    let hi = s.n - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const v = s.ids[mid];
      if (v === id) return mid;
      if (v < id) lo = mid + 1;
      else hi = mid - 1;
    }
    return -1;
  };
}

function meansInto(out: Uint16Array, at: number, sums: string): void {
  const parts = sums.split(',');
  for (let j = 0; j < INTERVALS; j++) out[at + j] = Number(parts[j + 1]) - Number(parts[j]);
}

async function loadBlock(s: Snapshot, lineId: string, level: number): Promise<GridBlock> {
  const rows = await db().sequelize.query<{ v: string; id: number; n: number; d: string; k: string | null }>(
    `SELECT (SELECT version::text FROM catalogue_version) AS v, f.curve_id AS id, f.n_eff_default AS n,
            array_to_string(f.direct, ',') AS d, array_to_string(f.canonical, ',') AS k
     FROM curve_fitness f JOIN curves c ON c.id = f.curve_id AND c.status = 'verified'
     WHERE f.line_id = $1 AND f.level = $2`,
    { bind: [lineId, level], type: QueryTypes.SELECT },
  );
  if (rows.length > 0 && rows[0].v !== s.version) throw new StaleCopy();
  const find = rowIndex(s);
  const m = rows.length;
  const rowOf = new Int32Array(s.n).fill(-1);
  const members = new Int32Array(m);
  const direct = new Uint16Array(m * INTERVALS);
  const canonRow = new Int32Array(m).fill(-1);
  const nEffDefault = new Float64Array(m);
  const withCanon = rows.filter((r) => r.k).length;
  const canonical = new Uint16Array(withCanon * INTERVALS);
  let c = 0;
  rows.forEach((r, j) => {
    const i = find(r.id);
    if (i < 0) throw new StaleCopy();
    rowOf[i] = j;
    members[j] = i;
    nEffDefault[j] = r.n;
    meansInto(direct, j * INTERVALS, r.d);
    if (r.k) {
      canonRow[j] = c;
      meansInto(canonical, c * INTERVALS, r.k);
      c++;
    }
  });
  const bytes = rowOf.byteLength + members.byteLength + direct.byteLength + canonRow.byteLength + canonical.byteLength + nEffDefault.byteLength;
  return { rowOf, members, direct, canonRow, canonical, nEffDefault, bytes };
}

async function loadFine(s: Snapshot, lineId: string): Promise<FineBlock> {
  const rows = await db().sequelize.query<{ v: string; id: number; g: string }>(
    `SELECT (SELECT version::text FROM catalogue_version) AS v, g.curve_id AS id, array_to_string(g.fine, ',') AS g
     FROM curve_fitness_fine g JOIN curves c ON c.id = g.curve_id AND c.status = 'verified'
     WHERE g.line_id = $1`,
    { bind: [lineId], type: QueryTypes.SELECT },
  );
  if (rows.length > 0 && rows[0].v !== s.version) throw new StaleCopy();
  const find = rowIndex(s);
  const width = FINE_INTERVALS + 1;
  const rowOf = new Int32Array(s.n).fill(-1);
  const sums = new Int32Array(rows.length * width);
  rows.forEach((r, j) => {
    const i = find(r.id);
    if (i < 0) throw new StaleCopy();
    rowOf[i] = j;
    const parts = r.g.split(',');
    for (let k = 0; k < width; k++) sums[j * width + k] = Number(parts[k]);
  });
  return { rowOf, sums, bytes: rowOf.byteLength + sums.byteLength };
}

function cached<T extends { bytes: number }>(s: Snapshot, map: Map<string, Promise<T>>, key: string, load: () => Promise<T>): Promise<T> {
  let p = map.get(key);
  if (!p) {
    p = load();
    map.set(key, p);
    p.then((b) => touch(s, key, b.bytes)).catch(() => map.delete(key));
  } else {
    p.then((b) => touch(s, key, b.bytes)).catch(() => undefined);
  }
  return p;
}

/** The grid of one line at one level (LEVEL_STEPS), loaded on first use. */
export function gridBlock(s: Snapshot, lineId: string, level: number): Promise<GridBlock> {
  if (level < 0 || level >= LEVEL_STEPS.length) throw new Error(`no fitness level ${level}`);
  return cached(s, s.blocks, `${lineId}|${level}`, () => loadBlock(s, lineId, level));
}

/** The fine level of one line's off-normal curves, loaded on first use. */
export function fineBlock(s: Snapshot, lineId: string): Promise<FineBlock> {
  return cached(s, s.fine, `fine|${lineId}`, () => loadFine(s, lineId));
}
