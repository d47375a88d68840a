import { Op } from 'sequelize';
import { db } from '@/db/models';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { SUBMISSION_STATUSES } from '@/db/models/submission';
import { forbidden, notFound, unprocessable } from '@/lib/http/errors';

type WithAuthor = { author?: { name: string | null; email: string } };
type WithContributor = { contributor?: { name: string | null; email: string } };

/** A contributor sees their own submissions; a moderator sees the whole queue. */
export async function listSubmissions(actor: Actor, status?: string) {
  if (status && !(SUBMISSION_STATUSES as readonly string[]).includes(status)) {
    throw unprocessable(`status must be one of ${SUBMISSION_STATUSES.join(', ')}.`);
  }
  const { Submission, User } = db();
  const where: Record<string, unknown> = {};
  if (status) where.status = status;
  if (!hasRole(actor, 'moderator')) where.contributorId = actor.id;
  const rows = await Submission.findAll({
    where,
    order: [['createdAt', 'ASC']],
    include: [{ model: User, as: 'contributor', attributes: ['id', 'name', 'email'] }],
    limit: 1000,
  });
  return {
    items: rows.map((s) => ({
      id: s.id, label: s.label, lines: s.lines, status: s.status, revision: s.revision, checkLevel: s.checkLevel,
      checkCounts: countLevels(s.checks), contributor: (s as unknown as WithContributor).contributor?.name ?? null,
      contributorId: s.contributorId, fileCount: (s.metadata as { files?: unknown[] }).files?.length ?? 1,
      createdAt: s.createdAt, updatedAt: s.updatedAt,
    })),
    total: rows.length,
  };
}

function countLevels(checks: { level: string }[]) {
  return { info: checks.filter((c) => c.level === 'info').length, warn: checks.filter((c) => c.level === 'warn').length, error: checks.filter((c) => c.level === 'error').length };
}

async function visibleSubmission(actor: Actor, id: number) {
  const { Submission, User } = db();
  const s = await Submission.findByPk(id, { include: [{ model: User, as: 'contributor', attributes: ['id', 'name', 'email'] }] });
  if (!s) throw notFound('No such submission.');
  // Another contributor's submission answers like a missing one.
  if (s.contributorId !== actor.id && !hasRole(actor, 'moderator')) throw notFound('No such submission.');
  return s;
}

export async function getSubmission(actor: Actor, id: number) {
  const s = await visibleSubmission(actor, id);
  const { SubmissionFile, Curve, Review, User, Submission } = db();
  const [files, curves, thread] = await Promise.all([
    SubmissionFile.findAll({ where: { submissionId: id }, attributes: { exclude: ['content'] }, order: [['revision', 'ASC'], ['id', 'ASC']] }),
    Curve.findAll({ where: { submissionId: id }, order: [['revision', 'ASC'], ['aoiDeg', 'ASC']] }),
    Review.findAll({ where: { submissionId: id }, order: [['createdAt', 'ASC']], include: [{ model: User, as: 'author', attributes: ['name', 'email', 'role'] }] }),
  ]);
  const contributor = (s as unknown as WithContributor).contributor;
  const history = hasRole(actor, 'moderator')
    ? await Submission.findAll({ where: { contributorId: s.contributorId, id: { [Op.ne]: id } }, attributes: ['id', 'label', 'status', 'createdAt'], order: [['createdAt', 'DESC']], limit: 20 })
    : [];
  return {
    id: s.id, status: s.status, revision: s.revision, label: s.label, lines: s.lines, metadata: s.metadata,
    checks: s.checks, checkLevel: s.checkLevel, replacesCurveId: s.replacesCurveId, createdAt: s.createdAt, decidedAt: s.decidedAt,
    contributor: { id: s.contributorId, name: contributor?.name ?? null },
    files: files.map((f) => ({ id: f.id, name: f.originalName, sizeBytes: f.sizeBytes, sha256: f.sha256, aoiDeg: f.aoiDeg, revision: f.revision, createdAt: f.createdAt })),
    curves: curves.map((c) => ({
      id: c.id, revision: c.revision, status: c.status, aoiDeg: c.aoiDeg, fileId: c.fileId, peakT: c.peakT, cwlNm: c.cwlNm, fwhmNm: c.fwhmNm,
      meanInBandT: c.meanInBandT, effectiveBandwidthNm: c.effectiveBandwidthNm, blockingOd: c.blockingOd, nEff: c.nEff, pointCount: c.pointCount,
    })),
    thread: thread.map((r) => {
      const author = (r as unknown as WithAuthor & { author?: { role: string } }).author;
      return { id: r.id, kind: r.kind, body: r.body, createdAt: r.createdAt, author: author?.name ?? author?.email ?? 'unknown', authorRole: author?.role ?? null };
    }),
    contributorHistory: history.map((h) => ({ id: h.id, label: h.label, status: h.status, createdAt: h.createdAt })),
  };
}

export async function getRawFile(actor: Actor, submissionId: number, fileId: number) {
  await visibleSubmission(actor, submissionId);
  const { SubmissionFile } = db();
  const file = await SubmissionFile.findOne({ where: { id: fileId, submissionId } });
  if (!file) throw notFound('No such file in this submission.');
  return file;
}
