import type { Metadata } from 'next';
import { requirePageRole } from '@/lib/auth/actor';
import { listOutgoingMail, type OutboxItem, type OutboxState } from '@/lib/mail/outbox';
import { AdminNav } from '../nav';

export const metadata: Metadata = { title: 'Outgoing mail' };
export const dynamic = 'force-dynamic';

const STATES: OutboxState[] = ['queued', 'sent', 'failed'];
const when = (d: Date) => `${d.toISOString().replace('T', ' ').slice(0, 19)} UTC`;

function stateLine(m: OutboxItem): string {
  if (m.state === 'sent') return `sent ${m.sentAt ? when(m.sentAt) : ''}${m.attempts > 1 ? ` after ${m.attempts} tries` : ''}`;
  if (m.state === 'failed') return `failed after ${m.attempts} ${m.attempts === 1 ? 'try' : 'tries'}`;
  return m.attempts === 0 ? 'queued' : `queued, ${m.attempts} of ${m.maxAttempts} tries so far`;
}

const STATE_CLASS: Record<OutboxState, string> = { queued: 'border-revise text-revise', sent: 'border-ok text-ok', failed: 'border-bad text-bad' };

export default async function AdminMailPage({ searchParams }: { searchParams: Promise<{ to?: string; state?: string }> }) {
  await requirePageRole('admin', '/admin/mail');
  const sp = await searchParams;
  const to = sp.to?.slice(0, 320);
  const state = STATES.find((s) => s === sp.state);
  const { items, counts } = await listOutgoingMail({ to, state });
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Administration</h1>
      <AdminNav current="mail" />
      <p className="text-sm text-muted">
        Every message the app sends goes through a queue and is retried while the mail server is away. Newest first, at most 200.
        Messages holding a one-time link (confirmations, resets, sign-in links) never show their text here.
      </p>
      <p className="flex flex-wrap gap-3 text-sm" data-testid="mail-counts">
        {STATES.map((s) => (
          <a key={s} href={`?state=${s}${to ? `&to=${encodeURIComponent(to)}` : ''}`} className={`rounded-card border px-2 py-0.5 ${STATE_CLASS[s]}`}>
            {s}: <span className="figures">{counts[s]}</span>
          </a>
        ))}
        {state ? <a href={to ? `?to=${encodeURIComponent(to)}` : '?'} className="underline">all states</a> : null}
      </p>
      <form className="flex flex-wrap gap-2 text-sm" method="get">
        <label htmlFor="to" className="sr-only">Recipient</label>
        <input id="to" name="to" defaultValue={to} placeholder="Filter by recipient" className="min-w-0 flex-1 rounded-card border border-rule bg-panel px-2 py-1" />
        {state ? <input type="hidden" name="state" value={state} /> : null}
        <button className="rounded-card border border-rule px-2 py-1">Filter</button>
      </form>
      <ul className="space-y-3">
        {items.map((m) => (
          <li key={m.id} className="rounded-card border border-rule bg-panel p-3 text-sm" data-testid="mail-item" data-state={m.state}>
            <details>
              <summary className="cursor-pointer break-words">
                <span className={`mr-2 inline-block rounded-card border px-1.5 text-xs ${STATE_CLASS[m.state]}`}>{stateLine(m)}</span>
                <span className="font-medium">{m.subject}</span>
                <span className="text-muted"> — to {m.recipients.join(', ')} · queued {when(m.createdAt)}</span>
              </summary>
              {m.lastError && m.state !== 'sent' ? <p className="mt-2 text-bad">Last error: {m.lastError}</p> : null}
              {m.body === null ? (
                <p className="mt-2 text-muted">{m.sensitive ? 'Holds a one-time link; not shown.' : '(no text)'}</p>
              ) : (
                <pre className="mt-2 whitespace-pre-wrap break-words font-mono text-xs">{m.body}</pre>
              )}
            </details>
          </li>
        ))}
        {items.length === 0 ? <li className="text-muted">No mail yet.</li> : null}
      </ul>
    </div>
  );
}
