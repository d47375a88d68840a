import { createHash } from 'node:crypto';
import { Op } from 'sequelize';
import { readCurveText, MAX_FILE_BYTES, MAX_ROWS } from '@/lib/engine/reader';
import { computeMetrics } from '@/lib/engine/metrics';
import { runChecks, normalisedPointsHash } from '@/lib/engine/checks';
import { temperatureSet } from '@/lib/engine/temperature';
import { fitEffectiveIndex, fitPolarisedIndices, type MeasuredPolarisation } from '@/lib/engine/neff';
import { neffPlausibility } from '@/lib/engine/checks';
import { CurveReadError } from '@/lib/engine/errors';
import type { CurvePoints, Metrics, Check } from '@/lib/engine/types';
import { HttpError, unprocessable, type ErrorDetail } from '@/lib/http/errors';
import type { SubmissionMetadata } from '@/lib/schemas/submission';
import { db } from '@/db/models';
import { hasRole, type Actor } from '@/lib/auth/actor';

export const MAX_FILES = 20;
export { MAX_FILE_BYTES, MAX_ROWS };

/** A file to submit; `uploadId` when it came through the file store's staging area (lib/storage/uploads.ts). */
export type IncomingFile = { name: string; bytes: Buffer; mediaType?: string; uploadId?: string };

export type ParsedFile = {
  name: string;
  bytes: Buffer;
  mediaType?: string;
  uploadId?: string;
  sha256: string;
  aoiDeg: number;
  /** The file's own temperature in a multi-temperature set, else the method's. */
  temperatureC?: number;
  /** The file's own polarisation in a polarised set (s and p files), else the method's. */
  polarization?: MeasuredPolarisation;
  points: CurvePoints;
  metrics: Metrics;
  pointsHash: string;
  assumed: unknown;
};

export type Intake = {
  files: ParsedFile[];
  checks: (Check & { file?: string })[];
  level: 'info' | 'warn' | 'error';
  nEff: number | null;
  /** s and p indices of a polarised set (docs/model.md §Polarised sets); null unless both fit. */
  nEffPolarised: { s: number; p: number } | null;
  tempCoeffNmPerC: number | null;
};

/** Refuses a whole upload before anything is written: limits first, then every file's content. */
export function checkLimits(files: IncomingFile[]) {
  if (files.length === 0) throw new HttpError(400, 'Attach at least one data file in the "file" field.');
  if (files.length > MAX_FILES) throw new HttpError(413, `At most ${MAX_FILES} files per submission; this one has ${files.length}.`);
  const big = files.find((f) => f.bytes.length > MAX_FILE_BYTES);
  if (big) throw new HttpError(413, `${big.name} is ${(big.bytes.length / 1048576).toFixed(1)} MB; the limit is 5 MB a file.`);
  const names = new Set<string>();
  for (const f of files) {
    if (names.has(f.name)) throw unprocessable(`Two files are named ${f.name}; rename one so each AOI can be told apart.`);
    names.add(f.name);
  }
}

function aoiFor(file: IncomingFile, metadata: SubmissionMetadata, count: number): number {
  const mapped = metadata.files?.find((f) => f.name === file.name);
  if (mapped) return mapped.aoiDeg;
  if (count === 1) return metadata.method.aoiDeg;
  throw unprocessable(`Give the AOI of ${file.name}: in a multi-angle set each file needs its own angle (metadata.files).`, [
    { field: 'files', message: `no AOI for ${file.name}` },
  ]);
}

export function parseFiles(files: IncomingFile[], metadata: SubmissionMetadata): ParsedFile[] {
  checkLimits(files);
  return files.map((file) => {
    let read;
    try {
      read = readCurveText(new Uint8Array(file.bytes), metadata.files?.find((f) => f.name === file.name)?.reader);
    } catch (err) {
      if (err instanceof CurveReadError) {
        const details: ErrorDetail[] = err.details.map((d) => ({ ...d, message: `${file.name}: ${d.message}` }));
        throw new HttpError(err.status, `${file.name}: ${err.message}`, details);
      }
      throw err;
    }
    const metrics = computeMetrics(read.points);
    return {
      name: file.name,
      bytes: file.bytes,
      mediaType: file.mediaType,
      uploadId: file.uploadId,
      sha256: createHash('sha256').update(file.bytes).digest('hex'),
      aoiDeg: aoiFor(file, metadata, files.length),
      temperatureC: metadata.files?.find((f) => f.name === file.name)?.temperatureC ?? metadata.method.temperatureC,
      polarization: metadata.files?.find((f) => f.name === file.name)?.polarization ?? metadata.method.polarization,
      points: read.points,
      metrics,
      pointsHash: createHash('sha256').update(normalisedPointsHash(read.points)).digest('hex'),
      assumed: read.assumed,
    };
  });
}

const LEVEL_RANK = { info: 0, warn: 1, error: 2 } as const;

/** The automatic checks, plus the one that needs the library: is this data already in it? */
/** The effective-index range the curves table (and the cone model) accepts. */
const N_EFF_STORED: [number, number] = [1, 4];

/**
 * `viewer` is who sent the files: a duplicate is named only when that person may
 * see it (a verified curve, one of their own, or anything for a moderator);
 * otherwise the check says only that the same points exist.
 */
export async function assess(
  parsed: ParsedFile[],
  metadata: SubmissionMetadata,
  viewer: Pick<Actor, 'id' | 'role'>,
  ignoreSubmissionId?: number,
): Promise<Intake> {
  const set = parsed.length > 1 ? parsed.map((p) => ({ aoiDeg: p.aoiDeg, tempC: p.temperatureC, metrics: p.metrics })) : undefined;
  const checks: Intake['checks'] = [];
  parsed.forEach((p) => {
    for (const c of runChecks({ metrics: p.metrics, metadata, aoiDeg: p.aoiDeg })) checks.push(parsed.length > 1 ? { ...c, file: p.name } : c);
  });
  if (set) checks.push(...runChecks({ metrics: parsed[0].metrics, metadata, set }).filter((c) => c.code.startsWith('set')));
  const { Curve } = db();
  const dupes = await Curve.findAll({
    where: {
      pointsHash: parsed.map((p) => p.pointsHash),
      status: { [Op.ne]: 'superseded' },
      ...(ignoreSubmissionId ? { submissionId: { [Op.ne]: ignoreSubmissionId } } : {}),
    },
    attributes: ['id', 'pointsHash', 'label', 'status', 'contributorId'],
  });
  const seesAll = hasRole(viewer as Actor, 'moderator');
  for (const d of dupes) {
    const file = parsed.find((p) => p.pointsHash === d.pointsHash);
    const named = seesAll || d.status === 'verified' || d.contributorId === viewer.id;
    const message = named
      ? `The same points are already in the library as curve ${d.id} (${d.label}).`
      : 'A curve with the same points exists.';
    checks.push({ code: 'duplicate', level: 'warn', message, file: file?.name });
  }
  let nEff: number | null = null;
  if (set) {
    try {
      const angles = parsed.filter((p) => p.metrics.cwlNm !== null).map((p) => ({ aoiDeg: p.aoiDeg, cwlNm: p.metrics.cwlNm as number }));
      nEff = fitEffectiveIndex(angles).nEff;
      // Outside the stored range the set check ("set-neff") already warns the moderator; store no value.
      if (!(nEff >= N_EFF_STORED[0] && nEff <= N_EFF_STORED[1])) nEff = null;
    } catch {
      nEff = null; // the set check above already says why
    }
  }
  const polarised = polarisedSet(parsed);
  checks.push(...polarised.checks);
  // one unit at several temperatures: fit dCWL/dT (lib/engine/temperature.ts)
  const temp = temperatureSet(parsed.map((p) => ({ aoiDeg: p.aoiDeg, tempC: p.temperatureC, cwlNm: p.metrics.cwlNm, polarization: p.polarization })), metadata.method.coating);
  checks.push(...temp.checks);
  const level = checks.reduce<Intake['level']>((acc, c) => (LEVEL_RANK[c.level] > LEVEL_RANK[acc] ? c.level : acc), 'info');
  return { files: parsed, checks, level, nEff, nEffPolarised: polarised.value, tempCoeffNmPerC: temp.fit ? temp.fit.nmPerC : null };
}

/**
 * s and p indices from the s and p files of a set (lib/engine/neff.ts), each
 * checked against what thin films allow like the set's own n_eff. Stored only
 * when both are plausible; otherwise the moderator sees why.
 */
export function polarisedSet(parsed: Pick<ParsedFile, 'aoiDeg' | 'polarization' | 'metrics'>[]): { value: { s: number; p: number } | null; checks: Check[] } {
  if (parsed.length < 2) return { value: null, checks: [] };
  const rows = parsed.filter((p) => p.metrics.cwlNm !== null).map((p) => ({ aoiDeg: p.aoiDeg, cwlNm: p.metrics.cwlNm as number, polarization: p.polarization }));
  let fit;
  try {
    fit = fitPolarisedIndices(rows);
  } catch (e) {
    return { value: null, checks: [{ code: 'set-neff-sp', level: 'warn', message: `The s and p files give no effective indices: ${e instanceof Error ? e.message : String(e)}` }] };
  }
  if (!fit) {
    const has = (pol: string) => rows.some((r) => r.polarization === pol);
    return has('s') || has('p')
      ? { value: null, checks: [{ code: 'set-neff-sp', level: 'info', message: 'Separate s and p indices need s curves and p curves each at two or more angles (a normal-incidence curve counts for both).' }] }
      : { value: null, checks: [] };
  }
  const cwl = fit.s.cwl0Nm;
  const checks: Check[] = [];
  let ok = true;
  for (const pol of ['s', 'p'] as const) {
    const f = fit[pol];
    const pl = neffPlausibility(f.nEff, cwl);
    if (!pl.plausible) ok = false;
    checks.push({ code: 'set-neff-sp', level: pl.plausible ? 'info' : 'warn', message: `${pol} light: ${pl.reason} (fitted from ${f.points.length} curves, RMS residual ${f.rmsResidualNm.toFixed(3)} nm)` });
  }
  return { value: ok ? { s: fit.s.nEff, p: fit.p.nEff } : null, checks };
}
