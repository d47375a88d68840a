import Link from 'next/link';

export function AdminNav({ current }: { current: 'users' | 'mail' | 'audit' }) {
  const items = [
    { key: 'users', href: '/admin/users', label: 'Users and roles' },
    { key: 'audit', href: '/admin/audit', label: 'Audit log' },
    { key: 'mail', href: '/admin/mail', label: 'Outgoing mail' },
  ] as const;
  return (
    <nav aria-label="Administration" className="flex gap-4 border-b border-rule pb-2 text-sm">
      {items.map((i) => (
        <Link key={i.key} href={i.href} aria-current={i.key === current ? 'page' : undefined}
          className={i.key === current ? 'font-semibold text-accent' : 'hover:text-accent'}>
          {i.label}
        </Link>
      ))}
    </nav>
  );
}
