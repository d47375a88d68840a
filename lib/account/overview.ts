import 'server-only';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { countLiveSessions } from '@/lib/auth/sessions';
import { countChecks } from '@/components/review/check-list';
import type { MySubmissionRow } from '@/components/account/my-submissions-table';

export type AccountView = {
  /** Own submissions only, whatever the role: a moderator's queue lives on /review. */
  submissions: MySubmissionRow[];
  /** Submissions with changes requested: the contributor's move. */
  waitingOnYou: number;
  /** Live sessions of a browser sign-in; null when the page is reached with an API token. */
  liveSessions: number | null;
};

export async function getAccountView(actor: Actor): Promise<AccountView> {
  const [mine, liveSessions] = await Promise.all([
    db().Submission.findAll({ where: { contributorId: actor.id }, order: [['createdAt', 'DESC']] }),
    actor.via === 'session' ? countLiveSessions(actor.id) : Promise.resolve(null),
  ]);
  const submissions: MySubmissionRow[] = mine.map((s) => ({
    id: s.id, label: s.label, lines: s.lines, status: s.status, revision: s.revision, checkCounts: countChecks(s.checks),
    fileCount: (s.metadata as { files?: unknown[] }).files?.length ?? 1, createdAt: s.createdAt.toISOString(), updatedAt: s.updatedAt.toISOString(),
  }));
  return { submissions, waitingOnYou: submissions.filter((r) => r.status === 'changes_requested').length, liveSessions };
}
