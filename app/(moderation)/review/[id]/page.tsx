import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/actor';
import { getSubmissionView } from '@/moderation/submission-view';
import { StatusBadge } from '@/components/review/status-badge';
import { CheckList, CheckSummary, countChecks } from '@/components/review/check-list';
import { CurvesTable, DeclaredFacts, FilesTable } from '@/components/review/submission-facts';
import { SubmissionChart } from '@/components/review/submission-chart';
import { Thread } from '@/components/review/thread';
import { DecisionForm } from '@/components/review/decision-form';
import { QualityList } from '@/components/review/quality-list';
import { assessCurveQuality } from '@/lib/engine/quality';
import { DEFAULT_N_EFF } from '@/lib/catalogue/fitness-grid';
import { formatSubmissionId } from '@/lib/labels';

export const metadata: Metadata = { title: 'Review' };

export default async function ReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await requirePageRole('moderator', `/review/${id}`);
  const s = await getSubmissionView(actor, id);
  const own = s.contributor.id === actor.id;
  return (
    <div className="space-y-8">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/review" className="underline underline-offset-2">Review queue</Link> / {formatSubmissionId(s.id)}
      </nav>
      <header className="space-y-2">
        <div className="flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-semibold">{s.label}</h1>
          <StatusBadge status={s.status} />
        </div>
        <p className="text-sm text-muted">
          Submission {formatSubmissionId(s.id)} · revision {s.revision} · from {s.contributor.name ?? 'unnamed contributor'} · sent {s.createdAt.slice(0, 10)} · <CheckSummary counts={countChecks(s.checks)} />
        </p>
      </header>

      <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_24rem]">
        <div className="min-w-0 space-y-6">
          <SubmissionChart label={s.label} points={s.points} nominalCwlNm={s.metadata.nominalCwlNm} nominalFwhmNm={s.metadata.nominalFwhmNm} lines={s.lines} />
          <section aria-labelledby="checks-heading" className="space-y-2">
            <h2 id="checks-heading" className="text-lg font-semibold">Automatic checks</h2>
            <div className="rounded-card border border-rule bg-panel p-4"><CheckList checks={s.checks} /></div>
          </section>
          <section aria-labelledby="quality-heading" className="space-y-2" data-testid="review-quality">
            <h2 id="quality-heading" className="text-lg font-semibold">Measurement quality</h2>
            <div className="space-y-3 rounded-card border border-rule bg-panel p-4">
              {s.points.map((p) => {
                const nEff = s.curves.find((c) => c.id === p.id)?.nEff ?? DEFAULT_N_EFF;
                const items = assessCurveQuality(p, (s.metadata.method ?? {}) as Record<string, unknown>, nEff);
                return <QualityList key={p.id} items={items} file={s.points.length > 1 ? `${p.aoiDeg}°` : undefined} />;
              })}
            </div>
          </section>
          <section aria-labelledby="numbers-heading" className="space-y-2">
            <h2 id="numbers-heading" className="text-lg font-semibold">Derived numbers</h2>
            <CurvesTable curves={s.curves} />
          </section>
          <DeclaredFacts metadata={s.metadata} />
          <section aria-labelledby="files-heading" className="space-y-2">
            <h2 id="files-heading" className="text-lg font-semibold">Raw files</h2>
            <FilesTable submissionId={s.id} files={s.files} currentRevision={s.revision} />
          </section>
        </div>
        <div className="space-y-6">
          {s.status !== 'submitted' ? (
            // Same test id as the form's confirmation: after a decision the refreshed page shows this instead.
            <p className="rounded-card border border-rule bg-panel p-4 text-sm" role="status" data-testid="decision-done">
              Already decided: <StatusBadge status={s.status} />. Nothing to do here until a revision comes back.
            </p>
          ) : own ? (
            <p className="rounded-card border border-wait/60 bg-wait/10 p-4 text-sm" role="note" data-testid="own-submission">
              This is your own submission. Another moderator must review it; you can still take part in the thread.
            </p>
          ) : (
            <DecisionForm submissionId={s.id} />
          )}
          <Thread key={`${s.thread.length}-${s.status}`} submissionId={s.id} items={s.thread} canPost placeholder="Ask the contributor without deciding…" />
          <section aria-labelledby="history-heading" className="space-y-2">
            <h2 id="history-heading" className="text-lg font-semibold">Contributor&apos;s other submissions</h2>
            {s.contributorHistory.length === 0 ? (
              <p className="text-sm text-muted">This is their first submission.</p>
            ) : (
              <ul className="space-y-1 text-sm" data-testid="contributor-history">
                {s.contributorHistory.map((h) => (
                  <li key={h.id} className="flex flex-wrap items-center gap-2">
                    <StatusBadge status={h.status} />
                    <Link href={`/review/${h.id}`} className="min-w-0 truncate text-accent underline underline-offset-2">{h.label}</Link>
                    <span className="figures ml-auto text-xs text-muted">{h.createdAt.slice(0, 10)}</span>
                  </li>
                ))}
              </ul>
            )}
          </section>
        </div>
      </div>
    </div>
  );
}
