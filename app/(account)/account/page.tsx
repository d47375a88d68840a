import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/actor';

export const metadata: Metadata = { title: 'Account' };

export default async function AccountPage() {
  const actor = await requirePageRole('contributor', '/account');
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-2xl font-semibold">Your account</h1>
      <dl className="grid grid-cols-[10rem_1fr] gap-y-2 text-sm">
        <dt className="text-muted">Name</dt>
        <dd>{actor.name}</dd>
        <dt className="text-muted">E-mail</dt>
        <dd>{actor.email}</dd>
        <dt className="text-muted">Role</dt>
        <dd data-testid="account-role">{actor.role}</dd>
      </dl>
    </div>
  );
}
