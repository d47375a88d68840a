import Link from 'next/link';
import { currentActor, hasRole } from '@/lib/auth/actor';
import { NightViewToggle } from './night-view';
import { SignOutButton } from './sign-out-button';
import { ROLE_LABELS, labelOf } from '@/lib/labels';

type NavItem = { href: string; label: string; show: boolean };

export async function SiteHeader() {
  const actor = await currentActor().catch(() => null);
  const nav: NavItem[] = [
    { href: '/curves', label: 'Catalogue', show: true },
    { href: '/study', label: 'Cone study', show: true },
    { href: '/compare', label: 'Compare', show: true },
    { href: '/optics', label: 'Optics', show: true },
    { href: '/submit', label: 'Submit', show: true },
    { href: '/review', label: 'Review queue', show: hasRole(actor, 'moderator') },
    { href: '/admin/users', label: 'Admin', show: hasRole(actor, 'admin') },
    { href: '/account', label: 'Account', show: !!actor },
  ];
  return (
    <header className="border-b border-rule bg-panel">
      <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3 sm:px-6">
        <Link href="/" className="flex items-baseline gap-2 font-semibold tracking-tight">
          <ConeMark />
          <span className="text-lg">Bandcone</span>
        </Link>
        <nav aria-label="Main" className="order-3 w-full sm:order-none sm:w-auto">
          <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            {nav.filter((n) => n.show).map((n) => (
              <li key={n.href}>
                <Link href={n.href} className="hover:text-accent underline-offset-4 hover:underline" data-nav={n.label}>
                  {n.label}
                </Link>
              </li>
            ))}
          </ul>
        </nav>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <NightViewToggle />
          {actor ? (
            <>
              <span className="hidden md:inline text-muted" data-testid="signed-in-as">
                {actor.name ?? actor.email} · {labelOf(ROLE_LABELS, actor.role)}
              </span>
              <SignOutButton />
            </>
          ) : (
            <Link href="/signin" className="rounded-card bg-accent px-3 py-1 text-accent-ink">
              Sign in
            </Link>
          )}
        </div>
      </div>
    </header>
  );
}

// A light cone narrowing onto a thin filter: the product in one glyph.
function ConeMark() {
  return (
    <svg width="22" height="16" viewBox="0 0 22 16" aria-hidden="true" className="self-center text-accent">
      <path d="M1 1 L15 8 L1 15 Z" fill="currentColor" opacity="0.35" />
      <rect x="15" y="1" width="2.5" height="14" fill="currentColor" />
      <path d="M19 8 H21.5" stroke="currentColor" strokeWidth="1.5" />
    </svg>
  );
}
