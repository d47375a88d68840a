import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/actor';
import { db } from '@/db/models';
import { AdminNav } from '../nav';
import { AuditTable, type AuditRow } from './audit-table';

export const metadata: Metadata = { title: 'Audit log' };
export const dynamic = 'force-dynamic';

export default async function AdminAuditPage() {
  await requirePageRole('admin', '/admin/audit');
  const { AuditEvent, User } = db();
  const events = await AuditEvent.findAll({ order: [['createdAt', 'DESC']], limit: 2000, include: [{ model: User, as: 'actor', attributes: ['email'] }] });
  const rows: AuditRow[] = events.map((e) => ({
    id: Number(e.id),
    at: e.createdAt.toISOString(),
    actor: (e as unknown as { actor?: { email: string } }).actor?.email ?? 'system',
    action: e.action,
    target: e.targetType ? `${e.targetType} ${e.targetId ?? ''}` : '',
    detail: JSON.stringify(e.detail),
  }));
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Administration</h1>
      <AdminNav current="audit" />
      <AuditTable rows={rows} />
    </div>
  );
}
