import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/actor';
import { listApiTokens } from '@/lib/account/api-tokens';
import { TokensPanel } from '@/components/account/tokens-panel';

export const metadata: Metadata = { title: 'API tokens' };

export default async function TokensPage() {
  const actor = await requirePageRole('contributor', '/account/tokens');
  const tokens = await listApiTokens(actor.id);
  const rows = tokens.map((t) => ({
    id: t.id, name: t.name, prefix: t.prefix, createdAt: t.createdAt.toISOString(),
    lastUsedAt: t.lastUsedAt ? t.lastUsedAt.toISOString() : null, revokedAt: t.revokedAt ? t.revokedAt.toISOString() : null,
  }));
  return (
    <div className="space-y-6">
      <nav aria-label="Breadcrumb" className="text-sm text-muted">
        <Link href="/account" className="underline underline-offset-2">Account</Link> / API tokens
      </nav>
      <header className="max-w-3xl space-y-2">
        <h1 className="text-2xl font-semibold">API tokens</h1>
        <p className="text-muted">
          A token lets a script on your test bench send curves as you, with <code className="figures">Authorization: Bearer …</code>, on every
          submission route. Revoke one the moment a machine is retired or the token may have leaked.
        </p>
        <p className="text-muted">
          Every route, its fields and its answers are in the <Link href="/docs/api" className="text-accent underline underline-offset-2">API reference</Link>.
        </p>
      </header>
      <TokensPanel initial={rows} />
    </div>
  );
}
