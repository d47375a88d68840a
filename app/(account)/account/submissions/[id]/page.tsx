import type { Metadata } from 'next';
import Link from 'next/link';
import { redirect } from 'next/navigation';
import { requirePageRole } from '@/lib/auth/actor';
import { getSubmissionView } from '@/moderation/submission-view';
import { StatusBadge } from '@/components/review/status-badge';
import { CheckList, CheckSummary, countChecks } from '@/components/review/check-list';
import { CurvesTable, DeclaredFacts, FilesTable } from '@/components/review/submission-facts';
import { SubmissionChart } from '@/components/review/submission-chart';
import { Thread } from '@/components/review/thread';
import { WorkbenchLoader } from '@/components/submit/workbench-loader';
import { LaserCaution } from '@/components/submit/laser-caution';
import type { MetadataForm } from '@/components/submit/metadata-fields';
import { formatSubmissionId } from '@/lib/labels';

export const metadata: Metadata = { title: 'Submission' };

const NEXT_STEP: Record<string, string> = {
  submitted: 'Waiting for a moderator. You will get an e-mail when one decides or writes a note.',
  changes_requested: 'A moderator asked for changes. Answer in the thread, or send a revision below: it goes back to the queue.',
  verified: 'Verified and public. A later correction is a new submission that links to this one.',
  rejected: 'Rejected. The reason is in the thread; you can still answer there.',
};

export default async function MySubmissionPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { id } = await params;
  const sp = await searchParams;
  const actor = await requirePageRole('contributor', `/account/submissions/${id}`);
  const s = await getSubmissionView(actor, id);
  // A moderator opening someone else's submission belongs on the review page.
  if (s.contributor.id !== actor.id) redirect(`/review/${s.id}`);
  const lastRequest = [...s.thread].reverse().find((t) => t.kind === 'request_changes');
  const currentFiles = s.files.filter((f) => f.revision === s.revision).map((f) => ({
    name: f.name, aoiDeg: f.aoiDeg, reader: s.metadata.files?.find((m) => m.name === f.name)?.reader as Record<string, never> | undefined,
  }));
  const { files: _files, ...initial } = s.metadata;
  return (
    <div className="space-y-8">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/account" className="underline underline-offset-2">Account</Link> / My submissions / {formatSubmissionId(s.id)}
      </nav>
      <header className="space-y-2">
        <div className="flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-semibold">{s.label}</h1>
          <StatusBadge status={s.status} />
        </div>
        <p className="text-sm text-muted">
          Submission {formatSubmissionId(s.id)} · revision {s.revision} · sent {s.createdAt.slice(0, 10)}{s.decidedAt ? ` · last decision ${s.decidedAt.slice(0, 10)}` : ''} · <CheckSummary counts={countChecks(s.checks)} />
        </p>
        {sp.sent ? <p role="status" className="rounded-card border border-ok/50 bg-ok/10 p-3 text-sm">Sent. It is in the review queue now; a moderator will check it against its method.</p> : null}
        {sp.revised ? <p role="status" className="rounded-card border border-ok/50 bg-ok/10 p-3 text-sm">Revision {s.revision} sent; it is back in the review queue.</p> : null}
        <p className="text-sm" data-testid="next-step">{NEXT_STEP[s.status]}</p>
      </header>

      {s.status === 'changes_requested' && lastRequest ? (
        <aside className="rounded-card border border-revise/60 bg-revise/5 p-4 text-sm" aria-label="What the moderator asked">
          <p className="font-medium text-revise">The moderator asked:</p>
          <p className="whitespace-pre-wrap">{lastRequest.body}</p>
        </aside>
      ) : null}

      <SubmissionChart label={s.label} points={s.points} nominalCwlNm={s.metadata.nominalCwlNm} nominalFwhmNm={s.metadata.nominalFwhmNm} lines={s.lines} />

      <section aria-labelledby="numbers-heading" className="space-y-2">
        <h2 id="numbers-heading" className="text-lg font-semibold">Derived numbers</h2>
        <CurvesTable curves={s.curves} />
      </section>

      <section aria-labelledby="checks-heading" className="space-y-2">
        <h2 id="checks-heading" className="text-lg font-semibold">Automatic checks</h2>
        <div className="rounded-card border border-rule bg-panel p-4"><CheckList checks={s.checks} /></div>
      </section>

      <section aria-labelledby="files-heading" className="space-y-2">
        <h2 id="files-heading" className="text-lg font-semibold">Files as uploaded</h2>
        <FilesTable submissionId={s.id} files={s.files} currentRevision={s.revision} />
      </section>

      <DeclaredFacts metadata={s.metadata} />

      <Thread key={`${s.thread.length}-${s.status}`} submissionId={s.id} items={s.thread} canPost placeholder="Answer the moderator, or explain a change…" />

      {s.status === 'changes_requested' ? (
        <section aria-labelledby="revise-heading" className="space-y-4 border-t border-rule pt-6">
          <h2 id="revise-heading" className="text-xl font-semibold">Send a revision</h2>
          <LaserCaution />
          <WorkbenchLoader mode={{ kind: 'revise', submissionId: s.id, initial: initial as Partial<MetadataForm>, currentFiles }} />
        </section>
      ) : null}
    </div>
  );
}
