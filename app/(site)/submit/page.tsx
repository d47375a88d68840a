import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/actor';
import { LaserCaution } from '@/components/submit/laser-caution';
import { WorkbenchLoader } from '@/components/submit/workbench-loader';

export const metadata: Metadata = { title: 'Submit a curve' };

export default async function SubmitPage() {
  await requirePageRole('contributor', '/submit');
  return (
    <div className="mx-auto max-w-5xl space-y-6">
      <header className="space-y-2">
        <h1 className="text-2xl font-semibold">Submit a measured curve</h1>
        <p className="max-w-3xl text-muted">
          Bring a transmission curve from your bench with the way you measured it. A moderator checks it against its method; once verified it
          is public, searchable and usable in every cone study. Scripts can send the same request with an{' '}
          <Link href="/account/tokens" className="text-accent underline underline-offset-2">API token</Link>.
        </p>
      </header>
      <LaserCaution />
      <WorkbenchLoader mode={{ kind: 'new' }} />
    </div>
  );
}
