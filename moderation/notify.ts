import type { Transaction } from 'sequelize';
import { db } from '@/db/models';
import { enqueueMail } from '@/lib/mail/queue';
import { siteUrl } from '@/lib/http/site';

const DECISION_WORDS: Record<string, string> = {
  verify: 'verified and published',
  request_changes: 'returned with a request for changes',
  reject: 'rejected',
};

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
    subject: `Review queue: ${label}${revision > 1 ? ` (revision ${revision})` : ''}`,
    text: `A submission is waiting for review: ${label}.\n${waiting} submission(s) are now in the queue.\n\n${siteUrl()}/review/${submissionId}`,
  }, transaction);
}

export async function notifyContributorOfDecision(submissionId: number, email: string, label: string, decision: string, note: string, transaction: Transaction) {
  await enqueueMail({
    kind: 'decision',
    to: email,
    subject: `Your submission "${label}" was ${DECISION_WORDS[decision] ?? decision}`,
    text:
      `A moderator ${DECISION_WORDS[decision] ?? decision} your submission "${label}".\n\n` +
      (note ? `Their note:\n${note}\n\n` : '') +
      `See it and answer at ${siteUrl()}/account/submissions/${submissionId}`,
  }, transaction);
}

export async function notifyOfNote(submissionId: number, to: string[], label: string, author: string, body: string, forModerators: boolean, transaction: Transaction) {
  const link = forModerators ? `${siteUrl()}/review/${submissionId}` : `${siteUrl()}/account/submissions/${submissionId}`;
  await enqueueMail({ kind: 'note', to, subject: `New note on "${label}"`, text: `${author} wrote:\n\n${body}\n\n${link}` }, transaction);
}
