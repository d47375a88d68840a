import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/actor';
import { db } from '@/db/models';
import { AdminNav } from '../nav';
import { UsersTable, type UserRow } from './users-table';

export const metadata: Metadata = { title: 'Users and roles' };
export const dynamic = 'force-dynamic';

export default async function AdminUsersPage() {
  const admin = await requirePageRole('admin', '/admin/users');
  const { User } = db();
  const users = await User.findAll({ order: [['createdAt', 'ASC']] });
  const rows: UserRow[] = users.map((u) => ({
    id: u.id, name: u.name ?? '', email: u.email, role: u.role, disabled: !!u.disabledAt,
    confirmed: !!u.emailVerified, createdAt: u.createdAt.toISOString(),
  }));
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Administration</h1>
      <AdminNav current="users" />
      <UsersTable rows={rows} selfId={admin.id} />
    </div>
  );
}
