import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/actor';
import { Op } from 'sequelize';
import { db } from '@/db/models';
import { AdminNav } from '../nav';

export const metadata: Metadata = { title: 'Outgoing mail' };
export const dynamic = 'force-dynamic';

export default async function AdminMailPage({ searchParams }: { searchParams: Promise<{ to?: string }> }) {
  await requirePageRole('admin', '/admin/mail');
  const { to } = await searchParams;
  const { MailMessage } = db();
  const where = to ? { envelopeTo: { [Op.contains]: [to.trim().toLowerCase()] } } : undefined;
  const messages = await MailMessage.findAll({ where, order: [['receivedAt', 'DESC']], limit: 200 });
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Administration</h1>
      <AdminNav current="mail" />
      <p className="text-sm text-muted">Mail the app sent, as received by the local catcher (newest first, at most 200).</p>
      <form className="flex gap-2 text-sm" method="get">
        <label htmlFor="to" className="sr-only">Recipient</label>
        <input id="to" name="to" defaultValue={to} placeholder="Filter by recipient" className="rounded-card border border-rule bg-panel px-2 py-1" />
        <button className="rounded-card border border-rule px-2 py-1">Filter</button>
      </form>
      <ul className="space-y-3">
        {messages.map((m) => (
          <li key={m.id} className="rounded-card border border-rule bg-panel p-3 text-sm" data-testid="mail-item">
            <details>
              <summary className="cursor-pointer">
                <span className="font-medium">{m.subject ?? '(no subject)'}</span>
                <span className="text-muted"> — to {m.envelopeTo.join(', ')} · {m.receivedAt.toISOString().replace('T', ' ').slice(0, 19)} UTC</span>
              </summary>
              <pre className="mt-2 whitespace-pre-wrap break-words font-mono text-xs">{m.textBody}</pre>
            </details>
          </li>
        ))}
        {messages.length === 0 ? <li className="text-muted">No mail yet.</li> : null}
      </ul>
    </div>
  );
}
