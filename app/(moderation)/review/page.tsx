import type { Metadata } from 'next';
import { requirePageRole, type Actor } from '@/lib/auth/actor';
import { listSubmissions } from '@/moderation/views';
import { QueueTable, type QueueRow } from '@/components/review/queue-table';

export const metadata: Metadata = { title: 'Review queue' };

/** The waiting submissions, and the moment they were read (the "waiting" column counts from it). */
async function loadQueue(actor: Actor): Promise<{ rows: QueueRow[]; now: number }> {
  const { items } = await listSubmissions(actor, 'submitted');
  const rows = items.map((s) => ({
    id: s.id, label: s.label, lines: s.lines, revision: s.revision, checkLevel: s.checkLevel as QueueRow['checkLevel'], checkCounts: s.checkCounts,
    contributor: s.contributor ?? 'unnamed', contributorId: s.contributorId, fileCount: s.fileCount,
    createdAt: new Date(s.createdAt).toISOString(), updatedAt: new Date(s.updatedAt).toISOString(), own: s.contributorId === actor.id,
  }));
  return { rows, now: Date.now() };
}

export default async function ReviewQueuePage() {
  const actor = await requirePageRole('moderator', '/review');
  const { rows, now } = await loadQueue(actor);
  return (
    <div className="space-y-4">
      <header className="space-y-1">
        <h1 className="text-2xl font-semibold">Review queue</h1>
        <p className="text-muted">
          <span className="figures">{rows.length}</span> {rows.length === 1 ? 'submission is' : 'submissions are'} waiting, oldest first. Read the checks, compare the curve
          with its method, then verify, ask for changes or reject.
        </p>
      </header>
      <QueueTable rows={rows} now={now} />
    </div>
  );
}
