import type { Transaction } from 'sequelize';
import { db } from '@/db/models';
import { enqueueMail } from '@/lib/mail/queue';
import { siteUrl } from '@/lib/http/site';
import { DECISION_PAST, formatCurveId, formatSubmissionId } from '@/lib/labels';

// Every function here queues its mail inside the caller's transaction (lib/mail/queue.ts):
// a decision, a note or a submission commits together with its mail, and is never held
// up or undone by SMTP; the queue sends after the answer and retries while the relay is down.

export async function notifyModeratorsOfSubmission(submissionId: number, label: string, revision: number, transaction: Transaction) {
  const { User, Submission } = db();
  const moderators = await User.findAll({ where: { role: ['moderator', 'admin'], disabledAt: null }, attributes: ['email'], transaction });
  const waiting = await Submission.count({ where: { status: 'submitted' }, transaction });
  await enqueueMail({
    kind: 'review_queue',
    to: moderators.map((m) => m.email),
    subject: `Review queue: ${formatSubmissionId(submissionId)} ${label}${revision > 1 ? ` (revision ${revision})` : ''}`,
    text: `A submission is waiting for review: ${label}.\n${waiting} submission(s) are now in the queue.\n\n${siteUrl()}/review/${submissionId}`,
  }, transaction);
}

/**
 * A verified submission's mail leads to the public page of what was published (one link per
 * curve of a multi-angle set); the submission page, where the thread goes on, comes after.
 */
export async function notifyContributorOfDecision(
  submissionId: number, email: string, label: string, decision: string, note: string, transaction: Transaction,
  published: { id: number; aoiDeg: number }[] = [],
) {
  const done = DECISION_PAST[decision] ?? decision;
  const ref = formatSubmissionId(submissionId);
  const curves = published.length === 1
    ? `It is public at ${siteUrl()}/curves/${published[0].id}\n\n`
    : published.length > 1
      ? `Its curves are public:\n${published.map((c) => `  ${formatCurveId(c.id)} at ${c.aoiDeg}° AOI: ${siteUrl()}/curves/${c.id}`).join('\n')}\n\n`
      : '';
  await enqueueMail({
    kind: 'decision',
    to: email,
    subject: `Your submission ${ref} "${label}" was ${done}`,
    text:
      `A moderator ${done} your submission ${ref} "${label}".\n\n` +
      curves +
      (note ? `Their note:\n${note}\n\n` : '') +
      `The submission and its thread: ${siteUrl()}/account/submissions/${submissionId}`,
  }, transaction);
}

export async function notifyOfNote(submissionId: number, to: string[], label: string, author: string, body: string, forModerators: boolean, transaction: Transaction) {
  const link = forModerators ? `${siteUrl()}/review/${submissionId}` : `${siteUrl()}/account/submissions/${submissionId}`;
  await enqueueMail({ kind: 'note', to, subject: `New note on ${formatSubmissionId(submissionId)} "${label}"`, text: `${author} wrote:\n\n${body}\n\n${link}` }, transaction);
}
