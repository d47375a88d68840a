import type { Metadata } from 'next';
import Link from 'next/link';
import { currentActor } from '@/lib/auth/actor';
import { listOptics } from '@/lib/optics/store';
import { OpticsManager } from '@/components/optics/optics-manager';

export const metadata: Metadata = { title: 'Optics' };

// Public for reading the examples; saving needs a sign-in, which the API checks.
export default async function OpticsPage() {
  const actor = await currentActor().catch(() => null);
  const optics = await listOptics(actor);
  return (
    <div className="space-y-6">
      <header className="max-w-3xl space-y-2">
        <p className="text-xs font-semibold uppercase tracking-wider text-accent">Optics</p>
        <h1 className="text-2xl font-semibold tracking-tight sm:text-3xl">The light cones your filters sit in</h1>
        <p className="leading-relaxed text-muted">
          An optic is what the cone model needs to know about a telescope or lens: its working f-number, its central obstruction and how far its chief ray tilts at
          the edge of the field. Type the hardware and the numbers are derived; open any optic in a <Link href="/study" className="text-accent underline-offset-4 hover:underline">cone study</Link>.
        </p>
      </header>
      <OpticsManager initial={optics} signedIn={!!actor} />
    </div>
  );
}
