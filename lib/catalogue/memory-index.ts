/**
 * A compact in-process copy of what a fitness search over the public catalogue
 * reads: each verified curve's filter columns, and, loaded on first use, the
 * fitness grid of one (line, level) at a time. PostgreSQL stays the source of
 * truth: every search first reads `catalogue_version` (bumped at the commit of
 * any change to curves or their grid rows, migration 0003) and, when it has
 * moved, brings the copy up to date by the curves that changed (logged per
 * version, migration 0009; see refreshSnapshot below); every read carries the
 * version in the same statement as the rows, so a copy never mixes two states
 * of the library.
 *
 * Why: τ for every curve of a line is a short dot product per curve (see
 * fitness-grid.ts). PostgreSQL spends about 1 µs per array subscript on it,
 * 40–100 ms for the 40 000 Hα curves of a 100 000-curve library; the same sum
 * over typed arrays takes a few milliseconds.
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { LINE_IDS } from '@/lib/engine/lines';
import { INSTRUMENTS } from '@/lib/engine/limits';
import { publicCatalogueSql } from '@/lib/auth/policy';
import { FINE_INTERVALS, LEVEL_LENGTH, LEVEL_STEPS } from './fitness-grid';
import { FWHM_EDGES } from './filters';
import { fitnessCacheBytes } from './cache-budget';
import { normalCwlNm, unitLeads } from './units';

/** One level of the fitness grid for one line: the stored running sums (LEVEL_LENGTH per row), as in curve_fitness. */
export interface GridBlock {
  /** Row of each snapshot curve in this block, or -1. */
  rowOf: Int32Array;
  /** Snapshot curve of each row. */
  members: Int32Array;
  direct: Int32Array;
  /** Row offset into `canonical` (in rows), or -1 when the curve keeps no canonical frame. */
  canonRow: Int32Array;
  canonical: Int32Array;
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
  /** CWL at normal incidence (units.ts), NaN when unknown: the CWL filter and order. */
  normalCwl: Float64Array;
  /** Index into `units` of the curve's set (set key and revision), -1 for a curve without a set. */
  unit: Int32Array;
  units: string[];
  blocks: Map<string, Promise<GridBlock>>;
  fine: Map<string, Promise<FineBlock>>;
  /** Blocks in order of last use, for the memory budget. */
  used: Map<string, number>;
}

const leads = new WeakMap<Snapshot, Uint8Array>();

/** 1 for a curve that stands for its unit in the copy (units.ts), worked out once per copy. */
export function unitLeadsOf(s: Snapshot): Uint8Array {
  let l = leads.get(s);
  if (!l) leads.set(s, (l = unitLeads(s.ids, s.aoi, s.unit)));
  return l;
}

/** Thrown when the library changed while a block was loading; the search starts over on a fresh copy. */
export class StaleCopy extends Error {
  constructor() {
    super('the catalogue changed while it was being read');
  }
}

const BUDGET_BYTES = fitnessCacheBytes();

const state = globalThis as unknown as { bandconeCatalogueCopy?: Promise<Snapshot> };

/** How the copy has been kept up to date in this process (tests read it). */
export const copyStats = { fullLoads: 0, patches: 0 };

/** PostgreSQL's width_bucket(x, edges): how many edges are ≤ x. */
export function widthBucket(x: number): number {
  let k = 0;
  while (k < FWHM_EDGES.length && FWHM_EDGES[k] <= x) k++;
  return k;
}

export async function currentVersion(): Promise<string> {
  const rows = await db().sequelize.query<{ v: string }>(`SELECT version::text AS v FROM catalogue_version`, { type: QueryTypes.SELECT });
  return rows[0]?.v ?? '0';
}

type SnapshotRow = {
  v: string; id: number | null; cwl: number | null; fwhm: number | null; peak: number; aoi: number; verified: number | null;
  instrument: string; contributor: string; lines: string; neff: number | null; unit: string | null;
};

const SNAPSHOT_COLUMNS = `c.id, c.cwl_nm AS cwl, c.fwhm_nm AS fwhm, c.peak_t AS peak, c.aoi_deg AS aoi,
            (extract(epoch FROM c.verified_at) * 1000000)::float8 AS verified, c.instrument, c.contributor_id AS contributor,
            array_to_string(c.lines, ' ') AS lines, c.n_eff AS neff, c.set_key || '|' || c.revision AS unit`;

async function loadSnapshot(): Promise<Snapshot> {
  // One statement, so the version and the rows are of the same moment (the LEFT JOIN from the
  // version row answers even for an empty catalogue). The unit and n_eff columns (units.ts) are
  // read from the table itself, not only the covering indexes. Many plain rows: node-postgres copes far better with
  // them than with one row of several megabytes.
  const rows = await db().sequelize.query<SnapshotRow>(
    `SELECT k.version::text AS v, ${SNAPSHOT_COLUMNS}
     FROM catalogue_version k LEFT JOIN curves c ON ${publicCatalogueSql()}`,
    { type: QueryTypes.SELECT },
  );
  copyStats.fullLoads++;
  return buildSnapshot(rows[0]?.v ?? '0', rows.filter((r) => r.id !== null).sort((a, z) => a.id! - z.id!));
}

function emptySnapshot(version: string, n: number): Snapshot {
  return {
    version,
    n,
    ids: new Int32Array(n),
    cwl: new Float64Array(n),
    fwhm: new Float64Array(n),
    peak: new Float64Array(n),
    aoi: new Float64Array(n),
    verifiedAt: new Float64Array(n),
    instrument: new Uint8Array(n),
    contributor: new Int32Array(n),
    contributors: [],
    lineSet: new Int32Array(n),
    lineSets: [],
    firstLine: new Int8Array(n),
    lineMask: new Int32Array(n),
    fwhmBucket: new Uint8Array(n),
    normalCwl: new Float64Array(n),
    unit: new Int32Array(n),
    units: [],
    blocks: new Map(),
    fine: new Map(),
    used: new Map(),
  };
}

/** Interns contributors and line sets as a snapshot is filled, so equal ones share one index. */
function interner(s: Snapshot) {
  const who = new Map(s.contributors.map((c, k) => [c, k]));
  const sets = new Map(s.lineSets.map((l, k) => [l.join(' '), k]));
  const units = new Map(s.units.map((u, k) => [u, k]));
  return {
    unit(key: string | null): number {
      if (key === null) return -1;
      let u = units.get(key);
      if (u === undefined) units.set(key, (u = s.units.push(key) - 1));
      return u;
    },
    contributor(id: string): number {
      let c = who.get(id);
      if (c === undefined) who.set(id, (c = s.contributors.push(id) - 1));
      return c;
    },
    lineSet(lines: string): number {
      let l = sets.get(lines);
      if (l === undefined) sets.set(lines, (l = s.lineSets.push(lines ? lines.split(' ') : []) - 1));
      return l;
    },
  };
}

/** Row i of the copy from a row read from PostgreSQL. */
function fillRow(s: Snapshot, i: number, r: SnapshotRow, names: ReturnType<typeof interner>) {
  s.ids[i] = r.id!;
  s.cwl[i] = r.cwl ?? NaN;
  s.fwhm[i] = r.fwhm ?? NaN;
  s.peak[i] = r.peak ?? NaN;
  s.aoi[i] = r.aoi ?? NaN;
  s.verifiedAt[i] = r.verified ?? NaN;
  const instrument = (INSTRUMENTS as readonly string[]).indexOf(r.instrument);
  // counted as another instrument it would put a wrong number in the facets
  if (instrument < 0) throw new Error(`curve ${r.id}: instrument "${r.instrument}" is not one the catalogue knows (${INSTRUMENTS.join(', ')})`);
  s.instrument[i] = instrument;
  s.contributor[i] = names.contributor(r.contributor);
  const l = names.lineSet(r.lines);
  s.lineSet[i] = l;
  s.firstLine[i] = (LINE_IDS as readonly string[]).indexOf(s.lineSets[l][0] ?? '');
  s.lineMask[i] = 0;
  for (const id of s.lineSets[l]) {
    const k = (LINE_IDS as readonly string[]).indexOf(id);
    if (k >= 0) s.lineMask[i] |= 1 << k;
  }
  s.fwhmBucket[i] = Number.isNaN(s.fwhm[i]) ? 0 : widthBucket(s.fwhm[i]) + 1;
  s.normalCwl[i] = normalCwlNm(r.cwl, s.aoi[i], r.neff) ?? NaN;
  s.unit[i] = names.unit(r.unit);
}

/** Row j of `to` is row i of `from`. */
function copyRow(from: Snapshot, i: number, to: Snapshot, j: number) {
  to.ids[j] = from.ids[i];
  to.cwl[j] = from.cwl[i];
  to.fwhm[j] = from.fwhm[i];
  to.peak[j] = from.peak[i];
  to.aoi[j] = from.aoi[i];
  to.verifiedAt[j] = from.verifiedAt[i];
  to.instrument[j] = from.instrument[i];
  to.contributor[j] = from.contributor[i];
  to.lineSet[j] = from.lineSet[i];
  to.firstLine[j] = from.firstLine[i];
  to.lineMask[j] = from.lineMask[i];
  to.fwhmBucket[j] = from.fwhmBucket[i];
  to.normalCwl[j] = from.normalCwl[i];
  to.unit[j] = from.unit[i];
}

function buildSnapshot(version: string, sorted: SnapshotRow[]): Snapshot {
  const s = emptySnapshot(version, sorted.length);
  const names = interner(s);
  sorted.forEach((r, i) => fillRow(s, i, r, names));
  return s;
}

/** The copy for the library as it is now (one read of catalogue_version when nothing changed). */
export async function catalogueCopy(): Promise<Snapshot> {
  const version = await currentVersion();
  const held = state.bandconeCatalogueCopy;
  let previous: Snapshot | null = null;
  if (held) {
    const s = await held.catch(() => null);
    if (s && s.version === version) return s;
    // a load already under way for this version is shared
    if (state.bandconeCatalogueCopy !== held) return catalogueCopy();
    previous = s;
  }
  const loading = previous ? refreshSnapshot(previous) : loadSnapshot();
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

/** Reads comma-separated integers into `out` from `outAt` without splitting the text into strings first; returns how many. */
export function readIntegerList(text: string, out: Int32Array, outAt = 0): number {
  let k = outAt;
  let value = 0;
  let negative = false;
  let inNumber = false;
  for (let p = 0; p <= text.length; p++) {
    const c = p < text.length ? text.charCodeAt(p) : 44;
    if (c >= 48 && c <= 57) {
      value = value * 10 + (c - 48);
      inNumber = true;
    } else if (c === 45 && !inNumber) negative = true;
    else if (c === 44) {
      if (!inNumber) throw new Error(`an empty number at character ${p}`);
      out[k++] = negative ? -value : value;
      value = 0;
      negative = false;
      inNumber = false;
    } else throw new Error(`"${String.fromCharCode(c)}" at character ${p} in a list of integers`);
  }
  return k - outAt;
}

type BlockRow = { v: string; id: number | null; neff: number; sums: string; canonical: string | null };

/** What a grid block reads of each curve_fitness row. */
const GRID_COLUMNS = `n_eff_default AS neff, array_to_string(direct, ',') AS sums, array_to_string(canonical, ',') AS canonical`;

/** Rows per read of a block: small enough that reading one never holds much more than the block itself (settable for tests). */
const chunkRows = () => Math.max(1, Number(process.env.BANDCONE_COPY_CHUNK ?? 4000));

/**
 * Reads the rows of one line (and level) in curve-id order, CHUNK at a time through the table's
 * key, handing over those of curves in the copy. Every read carries the catalogue version (the
 * LEFT JOIN LATERAL answers it even when no rows are left), so a change between two reads is seen.
 * Grid rows of curves outside the copy (superseded ones keep theirs) are skipped: the copy and the
 * rows are read at the same version, so such a curve is not verified in this state of the library.
 */
async function readRows(s: Snapshot, table: 'curve_fitness' | 'curve_fitness_fine', columns: string, where: string, bind: unknown[], onRow: (r: BlockRow, i: number) => void) {
  const find = rowIndex(s);
  const CHUNK = chunkRows();
  for (let after = 0; ; ) {
    const rows = await db().sequelize.query<BlockRow>(
      `SELECT k.version::text AS v, f.* FROM catalogue_version k LEFT JOIN LATERAL (
         SELECT curve_id AS id, ${columns} FROM ${table} WHERE ${where} AND curve_id > $${bind.length + 1} ORDER BY curve_id LIMIT ${CHUNK}
       ) f ON true`,
      { bind: [...bind, after], type: QueryTypes.SELECT },
    );
    if ((rows[0]?.v ?? '0') !== s.version) throw new StaleCopy();
    let real = 0;
    for (const r of rows) {
      if (r.id === null) continue;
      real++;
      after = r.id;
      const i = find(r.id);
      if (i >= 0) onRow(r, i);
    }
    if (real < CHUNK) return;
  }
}

/** Growing typed storage for rows of a fixed width, copied once into place at the end. */
function rowsOf(width: number) {
  const CHUNK = chunkRows();
  const parts: Int32Array[] = [];
  let part = new Int32Array(CHUNK * width);
  let used = 0;
  let count = 0;
  return {
    next(): { arr: Int32Array; at: number } {
      if (used === CHUNK) {
        parts.push(part);
        part = new Int32Array(CHUNK * width);
        used = 0;
      }
      count++;
      return { arr: part, at: used++ * width };
    },
    done(): Int32Array {
      const out = new Int32Array(count * width);
      parts.forEach((p, k) => out.set(p, k * CHUNK * width));
      out.set(part.subarray(0, used * width), parts.length * CHUNK * width);
      return out;
    },
  };
}

/** Collects a grid block row by row, in copy order: rows read from PostgreSQL, or carried over from an older block. */
function blockBuilder(n: number) {
  const rowOf = new Int32Array(n).fill(-1);
  const members: number[] = [];
  const neff: number[] = [];
  const canonOf: number[] = [];
  const direct = rowsOf(LEVEL_LENGTH);
  const canonical = rowsOf(LEVEL_LENGTH);
  const start = (i: number, nEff: number) => {
    rowOf[i] = members.length;
    members.push(i);
    neff.push(nEff);
  };
  return {
    fromRow(i: number, r: BlockRow) {
      start(i, r.neff);
      const d = direct.next();
      if (readIntegerList(r.sums, d.arr, d.at) !== LEVEL_LENGTH) throw new Error(`curve ${r.id}: a fitness level of the wrong length`);
      if (r.canonical) {
        const k = canonical.next();
        if (readIntegerList(r.canonical, k.arr, k.at) !== LEVEL_LENGTH) throw new Error(`curve ${r.id}: a canonical level of the wrong length`);
        canonOf.push(members.length - 1);
      }
    },
    fromBlock(i: number, b: GridBlock, row: number) {
      start(i, b.nEffDefault[row]);
      const d = direct.next();
      d.arr.set(b.direct.subarray(row * LEVEL_LENGTH, (row + 1) * LEVEL_LENGTH), d.at);
      const c = b.canonRow[row];
      if (c >= 0) {
        const k = canonical.next();
        k.arr.set(b.canonical.subarray(c * LEVEL_LENGTH, (c + 1) * LEVEL_LENGTH), k.at);
        canonOf.push(members.length - 1);
      }
    },
    done(): GridBlock {
      const canonRow = new Int32Array(members.length).fill(-1);
      canonOf.forEach((row, k) => (canonRow[row] = k));
      const block = { rowOf, members: Int32Array.from(members), direct: direct.done(), canonRow, canonical: canonical.done(), nEffDefault: Float64Array.from(neff) };
      const bytes = rowOf.byteLength + block.members.byteLength + block.direct.byteLength + canonRow.byteLength + block.canonical.byteLength + block.nEffDefault.byteLength;
      return { ...block, bytes };
    },
  };
}

async function loadBlock(s: Snapshot, lineId: string, level: number): Promise<GridBlock> {
  const out = blockBuilder(s.n);
  await readRows(s, 'curve_fitness', GRID_COLUMNS, 'line_id = $1 AND level = $2', [lineId, level], (r, i) => out.fromRow(i, r));
  return out.done();
}

async function loadFine(s: Snapshot, lineId: string): Promise<FineBlock> {
  const width = FINE_INTERVALS + 1;
  const rowOf = new Int32Array(s.n).fill(-1);
  const sums = rowsOf(width);
  let count = 0;
  await readRows(s, 'curve_fitness_fine', `array_to_string(fine, ',') AS sums`, 'line_id = $1', [lineId], (r, i) => {
    rowOf[i] = count++;
    const d = sums.next();
    if (readIntegerList(r.sums, d.arr, d.at) !== width) throw new Error(`curve ${r.id}: a fine level of the wrong length`);
  });
  const all = sums.done();
  return { rowOf, sums: all, bytes: rowOf.byteLength + all.byteLength };
}

/** One block read at a time, so readers arriving together do not all hold their rows in flight at once. */
let reading: Promise<unknown> = Promise.resolve();
function oneAtATime<T>(load: () => Promise<T>): Promise<T> {
  const next = reading.then(load, load);
  reading = next.catch(() => undefined);
  return next;
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
  return cached(s, s.blocks, `${lineId}|${level}`, () => oneAtATime(() => loadBlock(s, lineId, level)));
}

/** The fine level of one line's off-normal curves, loaded on first use. */
export function fineBlock(s: Snapshot, lineId: string): Promise<FineBlock> {
  return cached(s, s.fine, `fine|${lineId}`, () => oneAtATime(() => loadFine(s, lineId)));
}

/* ---------------------------------------------------------------------------------------------
 * Keeping the copy up to date by the curves that changed (migration 0009 logs them per version).
 *
 * A copy at version V and the library at W > V differ only in the curves logged for versions
 * V+1 … W. Each of those is taken out of the copy and, if it is verified now, read again with its
 * grid rows, all at version W; the rest of the copy, and of every grid block already held, is
 * carried over. So verifying a curve costs a few small reads instead of the whole library.
 * When the log does not reach back to V, or too many curves changed, the copy is read again whole.
 * ------------------------------------------------------------------------------------------- */

const PATCH_MAX = () => Number(process.env.BANDCONE_COPY_PATCH_MAX ?? 5000);

type ChangeRow = SnapshotRow & { versions: string; changed: number | null };

async function refreshSnapshot(old: Snapshot): Promise<Snapshot> {
  const limit = PATCH_MAX();
  const rows = await db().sequelize.query<ChangeRow>(
    `WITH k AS (SELECT version FROM catalogue_version),
          ch AS (SELECT DISTINCT x.curve_id FROM catalogue_changes x, k WHERE x.version > $1 AND x.version <= k.version LIMIT $2),
          logged AS (SELECT count(DISTINCT x.version) AS n FROM catalogue_changes x, k WHERE x.version > $1 AND x.version <= k.version)
     SELECT k.version::text AS v, (SELECT n FROM logged)::text AS versions, ch.curve_id AS changed, ${SNAPSHOT_COLUMNS}
     FROM k LEFT JOIN ch ON true LEFT JOIN curves c ON c.id = ch.curve_id AND ${publicCatalogueSql()}`,
    { bind: [old.version, limit + 1], type: QueryTypes.SELECT },
  );
  const version = rows[0]?.v ?? '0';
  const changed = new Set(rows.filter((r) => r.changed !== null).map((r) => r.changed!));
  // Every version in between must have left its curves in the log (each bump logs at least one).
  const complete = Number(rows[0]?.versions ?? 0) === Number(version) - Number(old.version);
  if (!complete || changed.size > limit || Number(version) < Number(old.version)) return loadSnapshot();

  const fresh = rows.filter((r) => r.id !== null).sort((a, z) => a.id! - z.id!);
  const { s, from } = mergeSnapshot(old, version, changed, fresh);
  const added = Int32Array.from(fresh, (r) => r.id!);
  // Grid blocks already held are carried over; one that cannot be (still loading, or the library
  // moved again meanwhile) is left out and read on first use, as it would be in a new copy.
  const carry = async <T extends { bytes: number }>(map: Map<string, Promise<T>>, into: Map<string, Promise<T>>, patch: (block: T, key: string) => Promise<T>) => {
    for (const [key, pending] of map) {
      // `used` names the blocks that have finished loading (and are within the memory budget).
      if (!old.used.has(key)) continue;
      try {
        const next = await patch(await pending, key);
        into.set(key, Promise.resolve(next));
        s.used.set(key, next.bytes);
      } catch (err) {
        if (!(err instanceof StaleCopy)) throw err;
      }
    }
  };
  await carry(old.blocks, s.blocks, (b, key) => {
    const [lineId, level] = key.split('|');
    return patchBlock(b, s, from, added, lineId, Number(level));
  });
  await carry(old.fine, s.fine, (b, key) => patchFine(b, s, from, added, key.slice('fine|'.length)));
  copyStats.patches++;
  return s;
}

/**
 * The copy at `version`: the old rows of unchanged curves and the fresh rows, in id order.
 * `from[j]` is the old row that new row j came from, or -1 for a fresh one.
 */
function mergeSnapshot(old: Snapshot, version: string, changed: Set<number>, fresh: SnapshotRow[]): { s: Snapshot; from: Int32Array } {
  let kept = 0;
  for (let i = 0; i < old.n; i++) if (!changed.has(old.ids[i])) kept++;
  const s = emptySnapshot(version, kept + fresh.length);
  s.contributors = [...old.contributors];
  s.lineSets = [...old.lineSets];
  s.units = [...old.units];
  const names = interner(s);
  const from = new Int32Array(s.n);
  let i = 0;
  let f = 0;
  for (let j = 0; j < s.n; j++) {
    while (i < old.n && changed.has(old.ids[i])) i++;
    if (f < fresh.length && (i >= old.n || fresh[f].id! < old.ids[i])) {
      fillRow(s, j, fresh[f++], names);
      from[j] = -1;
    } else {
      copyRow(old, i, s, j);
      from[j] = i++;
    }
  }
  return { s, from };
}

/** Reads the grid rows of the fresh curves for one block, at the copy's version. */
async function freshRows(s: Snapshot, table: 'curve_fitness' | 'curve_fitness_fine', columns: string, where: string, bind: unknown[], added: Int32Array) {
  if (added.length === 0) return [];
  const rows = await db().sequelize.query<BlockRow>(
    `SELECT k.version::text AS v, f.* FROM catalogue_version k LEFT JOIN LATERAL (
       SELECT curve_id AS id, ${columns} FROM ${table} WHERE ${where} AND curve_id = ANY($${bind.length + 1}::int[]) ORDER BY curve_id
     ) f ON true`,
    { bind: [...bind, Array.from(added)], type: QueryTypes.SELECT },
  );
  if ((rows[0]?.v ?? '0') !== s.version) throw new StaleCopy();
  const find = rowIndex(s);
  return rows.filter((r) => r.id !== null).map((r) => ({ r, i: find(r.id!) })).filter((x) => x.i >= 0);
}

async function patchBlock(b: GridBlock, s: Snapshot, from: Int32Array, added: Int32Array, lineId: string, level: number): Promise<GridBlock> {
  const fresh = await freshRows(s, 'curve_fitness', GRID_COLUMNS, 'line_id = $1 AND level = $2', [lineId, level], added);
  const freshAt = new Map(fresh.map((x) => [x.i, x.r]));
  const out = blockBuilder(s.n);
  // New rows in copy order, as a whole read would give them.
  for (let j = 0; j < s.n; j++) {
    const i = from[j];
    const r = i < 0 ? freshAt.get(j) : undefined;
    if (r) out.fromRow(j, r);
    else if (i >= 0 && b.rowOf[i] >= 0) out.fromBlock(j, b, b.rowOf[i]);
  }
  return out.done();
}

async function patchFine(b: FineBlock, s: Snapshot, from: Int32Array, added: Int32Array, lineId: string): Promise<FineBlock> {
  const width = FINE_INTERVALS + 1;
  const fresh = await freshRows(s, 'curve_fitness_fine', `array_to_string(fine, ',') AS sums`, 'line_id = $1', [lineId], added);
  const freshAt = new Map(fresh.map((x) => [x.i, x.r]));
  const rowOf = new Int32Array(s.n).fill(-1);
  const sums = rowsOf(width);
  let count = 0;
  for (let j = 0; j < s.n; j++) {
    const i = from[j];
    const oldRow = i >= 0 ? b.rowOf[i] : -1;
    const r = i < 0 ? freshAt.get(j) : undefined;
    if (oldRow < 0 && !r) continue;
    rowOf[j] = count++;
    const d = sums.next();
    if (r) {
      if (readIntegerList(r.sums, d.arr, d.at) !== width) throw new Error(`curve ${r.id}: a fine level of the wrong length`);
    } else {
      d.arr.set(b.sums.subarray(oldRow * width, (oldRow + 1) * width), d.at);
    }
  }
  const all = sums.done();
  return { rowOf, sums: all, bytes: rowOf.byteLength + all.byteLength };
}
