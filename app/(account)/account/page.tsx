import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/actor';
import { getAccountView } from '@/lib/account/overview';
import { MySubmissionsTable } from '@/components/account/my-submissions-table';
import { SignOutEverywhere } from '@/components/account/sign-out-everywhere';
import { ROLE_LABELS, labelOf } from '@/lib/labels';

export const metadata: Metadata = { title: 'Account' };

export default async function AccountPage() {
  const actor = await requirePageRole('contributor', '/account');
  const { submissions: rows, waitingOnYou, liveSessions } = await getAccountView(actor);
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-start gap-6">
        <div className="min-w-0 flex-1 space-y-4">
          <h1 className="text-2xl font-semibold">Your account</h1>
          <dl className="grid max-w-xl grid-cols-[8rem_1fr] gap-y-2 text-sm">
            <dt className="text-muted">Name</dt>
            <dd>{actor.name}</dd>
            <dt className="text-muted">E-mail</dt>
            <dd>{actor.email}</dd>
            <dt className="text-muted">Role</dt>
            <dd data-testid="account-role">{labelOf(ROLE_LABELS, actor.role)}</dd>
          </dl>
          {liveSessions !== null ? <SignOutEverywhere sessions={liveSessions} /> : null}
        </div>
        <nav aria-label="Account" className="flex flex-wrap gap-2 text-sm">
          <Link href="/submit" className="rounded-card bg-accent px-3 py-2 text-accent-ink">Submit a curve</Link>
          <Link href="/account/tokens" className="rounded-card border border-rule px-3 py-2 hover:border-accent">API tokens</Link>
        </nav>
      </div>
      <section aria-labelledby="mine-heading" className="space-y-3">
        <div className="flex flex-wrap items-baseline gap-3">
          <h2 id="mine-heading" className="text-lg font-semibold">My submissions</h2>
          {waitingOnYou > 0 ? (
            <p className="text-sm text-revise" role="status">{waitingOnYou} {waitingOnYou === 1 ? 'submission needs' : 'submissions need'} your changes</p>
          ) : null}
        </div>
        <MySubmissionsTable rows={rows} />
      </section>
    </div>
  );
}
