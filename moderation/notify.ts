import { db } from '@/db/models';
import { sendMail } from '@/lib/mail/send';

const site = () => process.env.NEXTAUTH_URL ?? 'http://127.0.0.1:3000';

const DECISION_WORDS: Record<string, string> = {
  verify: 'verified and published',
  request_changes: 'returned with a request for changes',
  reject: 'rejected',
};

// Mail failures must never undo a decision that is already committed; they are logged instead.
async function safeSend(to: string[], subject: string, text: string) {
  if (to.length === 0) return;
  try {
    await sendMail({ to, subject, text });
  } catch (err) {
    console.error('mail could not be sent', subject, err);
  }
}

export async function notifyModeratorsOfSubmission(submissionId: number, label: string, revision: number) {
  const { User } = db();
  const moderators = await User.findAll({ where: { role: ['moderator', 'admin'], disabledAt: null }, attributes: ['email'] });
  const waiting = await db().Submission.count({ where: { status: 'submitted' } });
  await safeSend(
    moderators.map((m) => m.email),
    `Review queue: ${label}${revision > 1 ? ` (revision ${revision})` : ''}`,
    `A submission is waiting for review: ${label}.\n${waiting} submission(s) are now in the queue.\n\n${site()}/review/${submissionId}`,
  );
}

export async function notifyContributorOfDecision(submissionId: number, email: string, label: string, decision: string, note: string) {
  await safeSend(
    [email],
    `Your submission "${label}" was ${DECISION_WORDS[decision] ?? decision}`,
    `A moderator ${DECISION_WORDS[decision] ?? decision} your submission "${label}".\n\n` +
      (note ? `Their note:\n${note}\n\n` : '') +
      `See it and answer at ${site()}/account/submissions/${submissionId}`,
  );
}

export async function notifyOfNote(submissionId: number, to: string[], label: string, author: string, body: string, forModerators: boolean) {
  const link = forModerators ? `${site()}/review/${submissionId}` : `${site()}/account/submissions/${submissionId}`;
  await safeSend(to, `New note on "${label}"`, `${author} wrote:\n\n${body}\n\n${link}`);
}
