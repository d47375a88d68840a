import type { Transaction } from 'sequelize';
import { db } from '@/db/models';
import { audit } from '@/lib/audit';
import { submissionMetadataSchema, type SubmissionMetadata } from '@/lib/schemas/submission';
import { conflict, forbidden, notFound, HttpError } from '@/lib/http/errors';
import { parseJsonText } from '@/lib/http/body';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { assess, parseFiles, type IncomingFile, type Intake } from './intake';
import { notifyModeratorsOfSubmission } from './notify';
import { forgetStages, rawFileBytes, removeStagedObjects, storeRawFiles } from '@/lib/storage/uploads';
import { STORE_DOWN_UPLOAD } from '@/lib/storage/errors';

const stagedIds = (intake: Intake) => intake.files.flatMap((f) => (f.uploadId ? [f.uploadId] : []));

/** What POST /api/submissions and its revise route answer. */
export type SubmissionAnswer = Awaited<ReturnType<typeof createSubmission>> | Awaited<ReturnType<typeof reviseSubmission>>;

export function parseMetadata(raw: unknown): SubmissionMetadata {
  let value = raw;
  if (typeof raw === 'string') value = parseJsonText(raw, 'The "metadata" field');
  if (value === undefined || value === null) throw new HttpError(400, 'Send the "metadata" field: a JSON string of the filter and its test method.');
  return submissionMetadataSchema.parse(value);
}

async function insertCurves(submissionId: number, contributorId: string, revision: number, metadata: SubmissionMetadata, intake: Intake, status: 'submitted', transaction: Transaction, replacesCurveId: number | null) {
  const { SubmissionFile, Curve } = db();
  const setKey = intake.files.length > 1 ? `submission-${submissionId}` : null;
  const ids: number[] = [];
  for (const f of intake.files) {
    const file = await SubmissionFile.create(
      // The bytes are in the file store already (storeRawFiles, before this transaction); the row names them by hash.
      { submissionId, revision, originalName: f.name, sizeBytes: f.bytes.length, sha256: f.sha256, content: null, mediaType: f.mediaType ?? 'text/plain', aoiDeg: f.aoiDeg },
      { transaction },
    );
    const m = f.metrics;
    const curve = await Curve.create(
      {
        submissionId, fileId: file.id, contributorId, status, setKey, revision, replacesCurveId,
        label: metadata.label, maker: metadata.maker ?? null, lines: metadata.lines,
        nominalCwlNm: metadata.nominalCwlNm, nominalFwhmNm: metadata.nominalFwhmNm,
        declaredPreShiftNm: metadata.declaredPreShiftNm ?? null, serial: metadata.serial ?? null,
        sizeMm: metadata.sizeMm ?? null, notes: metadata.notes ?? null, licence: metadata.licence,
        method: { ...metadata.method, aoiDeg: f.aoiDeg, ...(f.temperatureC !== undefined ? { temperatureC: f.temperatureC } : {}), ...(f.polarization ? { polarization: f.polarization } : {}) }, instrument: metadata.method.instrument, aoiDeg: f.aoiDeg,
        lab: metadata.method.lab ?? null, measuredOn: metadata.method.measuredOn ?? null,
        wavelengthNm: f.points.wavelengthNm, transmission: f.points.transmission, pointCount: f.points.wavelengthNm.length,
        pointsHash: f.pointsHash, peakT: m.peakT, cwlNm: m.cwlNm, fwhmNm: m.fwhmNm, meanInBandT: m.meanInBandT,
        effectiveBandwidthNm: m.effectiveBandwidthNm, blockingOd: m.blockingOd,
        lineTransmission: Object.fromEntries(m.lines.map((l) => [l.id, l.transmission])), nEff: intake.nEff, nEffS: intake.nEffPolarised?.s ?? null, nEffP: intake.nEffPolarised?.p ?? null, tempCoeffNmPerC: intake.tempCoeffNmPerC, verifiedAt: null,
      },
      { transaction },
    );
    ids.push(curve.id);
  }
  await forgetStages(stagedIds(intake), transaction);
  return ids;
}

/** One transaction: the submission, its raw files and its curves appear together or not at all. */
export async function createSubmission(actor: Pick<Actor, 'id' | 'role'>, metadata: SubmissionMetadata, files: IncomingFile[], options: { replacesCurveId?: number; notify?: boolean } = {}) {
  const intake = await assess(parseFiles(files, metadata), metadata, actor);
  const { Submission, Curve, sequelize } = db();
  let replaces: number | null = null;
  let revision = 1;
  if (options.replacesCurveId) {
    const old = await Curve.findByPk(options.replacesCurveId);
    if (!old || old.status !== 'verified') throw notFound('Only a verified curve can be corrected by a new revision.');
    replaces = old.id;
    revision = old.revision + 1;
  }
  // Raw files reach the file store before any row names them; if the store is away, a 503 and no rows.
  await storeRawFiles(intake.files);
  const result = await sequelize.transaction(async (transaction) => {
    const submission = await Submission.create(
      {
        contributorId: actor.id, label: metadata.label, lines: metadata.lines, metadata: metadata as unknown as Record<string, unknown>,
        // A correction of a verified curve starts at that curve's next revision, so the submission and
        // its curves share one number (the decision selects its curves by it).
        checks: intake.checks, checkLevel: intake.level, replacesCurveId: replaces, revision,
      },
      { transaction },
    );
    const curveIds = await insertCurves(submission.id, actor.id, revision, metadata, intake, 'submitted', transaction, replaces);
    await audit(actor.id, 'submission.created', { type: 'submission', id: submission.id }, { label: metadata.label, files: intake.files.map((f) => f.name), curveIds }, transaction);
    if (options.notify !== false) await notifyModeratorsOfSubmission(submission.id, metadata.label, revision, transaction);
    return { submission, curveIds };
  });
  await removeStagedObjects(stagedIds(intake));
  return { id: result.submission.id, status: result.submission.status, checks: intake.checks, curveIds: result.curveIds, nEff: intake.nEff };
}

/** After "changes requested", the submitter sends new files and/or metadata; old revisions stay on record. */
export async function reviseSubmission(actor: Pick<Actor, 'id' | 'role'>, submissionId: number, metadataRaw: unknown | undefined, files: IncomingFile[]) {
  const { Submission, SubmissionFile, Curve, sequelize } = db();
  const current = await Submission.findByPk(submissionId);
  if (!current) throw notFound('No such submission.');
  // Someone who may not see the submission learns nothing, not even that it exists.
  if (current.contributorId !== actor.id && !hasRole(actor as Actor, 'moderator')) throw notFound('No such submission.');
  if (current.contributorId !== actor.id) throw forbidden('Only the contributor who sent this submission can revise it.');
  if (current.status !== 'changes_requested') throw conflict(`This submission is ${current.status.replace('_', ' ')}; only one with changes requested can be revised.`);
  const metadata = metadataRaw === undefined ? parseMetadata(current.metadata) : parseMetadata(metadataRaw);
  let incoming = files;
  if (incoming.length === 0) {
    const previous = await SubmissionFile.findAll({ where: { submissionId, revision: current.revision }, order: [['id', 'ASC']] });
    incoming = await Promise.all(previous.map(async (f) => ({ name: f.originalName, bytes: await rawFileBytes(f, STORE_DOWN_UPLOAD), mediaType: f.mediaType })));
    if (!metadata.files && previous.length > 1) metadata.files = previous.map((f) => ({ name: f.originalName, aoiDeg: f.aoiDeg }));
  }
  const intake = await assess(parseFiles(incoming, metadata), metadata, actor, submissionId);
  const revision = current.revision + 1;
  await storeRawFiles(intake.files);
  const result = await sequelize.transaction(async (transaction) => {
    const locked = await Submission.findByPk(submissionId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!locked || locked.status !== 'changes_requested') throw conflict('This submission changed while you were revising it; reload and try again.');
    await Curve.update({ status: 'superseded' }, { where: { submissionId, status: 'changes_requested' }, transaction });
    await locked.update(
      { status: 'submitted', revision, label: metadata.label, lines: metadata.lines, metadata: metadata as unknown as Record<string, unknown>, checks: intake.checks, checkLevel: intake.level },
      { transaction },
    );
    const curveIds = await insertCurves(submissionId, actor.id, revision, metadata, intake, 'submitted', transaction, locked.replacesCurveId ?? null);
    await audit(actor.id, 'submission.revised', { type: 'submission', id: submissionId }, { revision, files: intake.files.map((f) => f.name), curveIds }, transaction);
    await notifyModeratorsOfSubmission(submissionId, metadata.label, revision, transaction);
    return { curveIds };
  });
  await removeStagedObjects(stagedIds(intake));
  return { id: submissionId, status: 'submitted' as const, revision, checks: intake.checks, curveIds: result.curveIds, nEff: intake.nEff };
}
