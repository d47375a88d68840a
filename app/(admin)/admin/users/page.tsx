import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/actor';
import { getUsers } from '@/lib/admin/users';
import { usersQuerySchema } from '@/lib/schemas/admin';
import { ACCESS_LABELS, ROLE_LABELS } from '@/lib/labels';
import { FilterSelect, Pager, filterInput as input } from '@/components/admin/filters';
import { AdminNav } from '../nav';
import { UsersTable } from './users-table';

export const metadata: Metadata = { title: 'Users and roles' };
export const dynamic = 'force-dynamic';

export default async function AdminUsersPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const admin = await requirePageRole('admin', '/admin/users');
  const raw = await searchParams;
  const query = usersQuerySchema.parse(Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v])));
  const view = await getUsers(admin, query);
  const filtered = !!(query.q || query.role || query.access);
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Administration</h1>
      <AdminNav current="users" />
      <form method="get" role="search" aria-label="Find users" className="grid gap-3 text-sm sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)_auto]">
        <label className="space-y-1">
          <span className="block font-medium">Name or e-mail</span>
          <input type="search" name="q" defaultValue={query.q} placeholder="part of a name or address" className={input} />
        </label>
        <FilterSelect name="role" label="Role" value={query.role} any="any role" options={ROLE_LABELS} />
        <FilterSelect name="access" label="State" value={query.access} any="any state" options={ACCESS_LABELS} />
        <div className="flex items-end gap-3">
          <button className="rounded-card bg-accent px-3 py-1.5 text-accent-ink">Find</button>
          {filtered ? <Link href="/admin/users" className="underline underline-offset-2">Show all</Link> : null}
        </div>
      </form>
      <Pager path="/admin/users" query={query} page={view.page} pages={view.pages} total={view.total} noun={['user', 'users']} />
      {view.rows.length ? (
        <UsersTable key={JSON.stringify(query)} rows={view.rows} selfId={view.selfId} />
      ) : (
        <p className="text-muted" data-testid="users-empty">{filtered ? 'No user matches.' : 'No users yet.'}</p>
      )}
    </div>
  );
}
