import { Op } from 'sequelize';
import { db } from '@/db/models';
import { audit } from '@/lib/audit';
import { conflict, forbidden, notFound } from '@/lib/http/errors';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { notifyContributorOfDecision, notifyOfNote } from './notify';
import { storeDerivedForSubmission } from '@/lib/catalogue/derived-store';

export type Decision = 'verify' | 'request_changes' | 'reject';

/** What the review and notes routes answer. */
export type DecisionAnswer = Awaited<ReturnType<typeof decide>>;
export type NoteAnswer = Awaited<ReturnType<typeof addNote>>;

const NEXT_STATUS = { verify: 'verified', request_changes: 'changes_requested', reject: 'rejected' } as const;

/**
 * The row lock makes two moderators deciding at once safe: the second waits,
 * then finds the submission no longer waiting and gets a 409.
 */
export async function decide(moderator: Pick<Actor, 'id' | 'role'>, submissionId: number, decision: Decision, note: string, options: { notify?: boolean } = {}) {
  if (!hasRole(moderator as Actor, 'moderator')) throw forbidden('Only moderators decide on submissions.');
  const { Submission, Curve, Review, User, sequelize } = db();
  const outcome = await sequelize.transaction(async (transaction) => {
    const submission = await Submission.findByPk(submissionId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!submission) throw notFound('No such submission.');
    if (submission.contributorId === moderator.id) throw forbidden('A moderator never decides on their own submission; another moderator must review it.');
    if (submission.status !== 'submitted') throw conflict(`This submission is already ${submission.status.replace('_', ' ')}; reload the queue.`);
    const status = NEXT_STATUS[decision];
    const now = new Date();
    await submission.update({ status, decidedAt: now }, { transaction });
    const current = { submissionId, revision: submission.revision, status: 'submitted' };
    await Curve.update({ status, ...(decision === 'verify' ? { verifiedAt: now } : {}) }, { where: current, transaction });
    // Fitness grid and sparkline in the same transaction: a verified curve is never missing from fitness searches.
    if (decision === 'verify') await storeDerivedForSubmission(submissionId, submission.revision, transaction);
    if (decision === 'verify' && submission.replacesCurveId) {
      // The corrected curve replaces the old one in search; the old one stays readable by its id.
      await Curve.update({ status: 'superseded' }, { where: { id: submission.replacesCurveId, status: 'verified' }, transaction });
    }
    await Review.create({ submissionId, authorId: moderator.id, kind: decision, body: note, isPublic: decision === 'verify' }, { transaction });
    await audit(moderator.id, `submission.${decision}`, { type: 'submission', id: submissionId }, { note, revision: submission.revision }, transaction);
    const contributor = await User.findByPk(submission.contributorId, { transaction, attributes: ['email'] });
    // The mail is queued in the same transaction: the decision and its mail exist together or not at all.
    const published = decision === 'verify'
      ? (await Curve.findAll({ where: { submissionId, revision: submission.revision, status: 'verified' }, attributes: ['id', 'aoiDeg'], order: [['aoiDeg', 'ASC'], ['id', 'ASC']], transaction })).map((c) => ({ id: c.id, aoiDeg: c.aoiDeg }))
      : [];
    if (contributor?.email && options.notify !== false) await notifyContributorOfDecision(submissionId, contributor.email, submission.label, decision, note, transaction, published);
    return { status };
  });
  return { id: submissionId, status: outcome.status };
}

/** A note in the thread: the contributor answers, or a moderator asks without deciding. */
export async function addNote(actor: Pick<Actor, 'id' | 'role' | 'name' | 'email'>, submissionId: number, body: string) {
  const { Submission, Review, User, sequelize } = db();
  const submission = await Submission.findByPk(submissionId);
  if (!submission) throw notFound('No such submission.');
  const isOwner = submission.contributorId === actor.id;
  const isModerator = hasRole(actor as Actor, 'moderator');
  // Another contributor's submission answers like a missing one.
  if (!isOwner && !isModerator) throw notFound('No such submission.');
  // The note, its audit row and its mail commit together.
  const review = await sequelize.transaction(async (transaction) => {
    const review = await Review.create({ submissionId, authorId: actor.id, kind: isOwner ? 'reply' : 'note', body }, { transaction });
    await audit(actor.id, 'submission.note', { type: 'submission', id: submissionId }, { kind: review.kind }, transaction);
    if (isOwner) {
      const moderators = await Review.findAll({ where: { submissionId, kind: { [Op.ne]: 'reply' } }, include: [{ model: User, as: 'author', attributes: ['email'] }], transaction });
      const to = [...new Set(moderators.map((r) => (r as unknown as { author?: { email: string } }).author?.email).filter((e): e is string => !!e))];
      await notifyOfNote(submissionId, to, submission.label, actor.name ?? actor.email, body, true, transaction);
    } else {
      const owner = await User.findByPk(submission.contributorId, { attributes: ['email'], transaction });
      if (owner) await notifyOfNote(submissionId, [owner.email], submission.label, actor.name ?? actor.email, body, false, transaction);
    }
    return review;
  });
  return { id: review.id, kind: review.kind, body: review.body, createdAt: review.createdAt };
}
