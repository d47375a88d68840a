import type { Metadata } from 'next';
import Link from 'next/link';
import { requirePageRole } from '@/lib/auth/actor';
import { getAuditLog } from '@/lib/admin/audit';
import { auditQuerySchema } from '@/lib/schemas/admin';
import { TARGET_TYPE_LABELS } from '@/lib/labels';
import { FilterSelect, Pager, filterInput as input, hrefWith } from '@/components/admin/filters';
import { AdminNav } from '../nav';

export const metadata: Metadata = { title: 'Audit log' };
export const dynamic = 'force-dynamic';

const cell = 'border-b border-rule/60 px-2 py-1.5 max-sm:block max-sm:border-0 max-sm:py-0.5';
const FAMILIES = [
  { value: 'user.', label: 'Any account action' },
  { value: 'submission.', label: 'Any submission action' },
  { value: 'token.', label: 'Any API token action' },
];

export default async function AdminAuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const admin = await requirePageRole('admin', '/admin/audit');
  const raw = await searchParams;
  const query = auditQuerySchema.parse(Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v])));
  const view = await getAuditLog(admin, query);
  const { page: _page, ...filters } = query;
  const filtered = Object.values(filters).some((v) => v !== undefined);
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Administration</h1>
      <AdminNav current="audit" />
      <p className="text-sm text-muted">Every change of who may do what, and of what the library holds. Newest first; times in UTC. The filters live in the address, so a filtered view can be bookmarked or sent.</p>
      <form method="get" aria-label="Filter the audit log" className="grid gap-3 text-sm sm:grid-cols-2 lg:grid-cols-3">
        <label className="space-y-1">
          <span className="block font-medium">Who</span>
          <input name="actor" defaultValue={query.actor} placeholder="name, e-mail or “system”" className={input} />
        </label>
        <label className="space-y-1">
          <span className="block font-medium">What</span>
          <select name="action" defaultValue={query.action ?? ''} className={input}>
            <option value="">Any action</option>
            <optgroup label="Families">
              {FAMILIES.map((f) => <option key={f.value} value={f.value}>{f.label}</option>)}
            </optgroup>
            <optgroup label="Actions">
              {view.actions.map((a) => <option key={a.value} value={a.value}>{a.label}</option>)}
            </optgroup>
          </select>
        </label>
        <div className="grid grid-cols-[auto_minmax(0,1fr)] gap-2">
          <FilterSelect name="targetType" label="On" value={query.targetType} any="anything" options={TARGET_TYPE_LABELS} />
          <label className="space-y-1">
            <span className="block font-medium">Target</span>
            <input name="target" defaultValue={query.target} placeholder="S-87, C-111 or an e-mail" className={input} />
          </label>
        </div>
        <label className="space-y-1">
          <span className="block font-medium">From (UTC day)</span>
          <input type="date" name="from" defaultValue={query.from} className={input} />
        </label>
        <label className="space-y-1">
          <span className="block font-medium">To (UTC day, included)</span>
          <input type="date" name="to" defaultValue={query.to} className={input} />
        </label>
        <div className="flex items-end gap-3">
          <button className="rounded-card bg-accent px-3 py-1.5 text-accent-ink">Filter</button>
          {filtered ? <Link href="/admin/audit" className="underline underline-offset-2">Clear the filters</Link> : null}
        </div>
      </form>
      {view.notes.map((n) => <p key={n} role="alert" className="text-sm text-bad">{n}</p>)}
      <Pager path="/admin/audit" query={query} page={view.page} pages={view.pages} total={view.total} noun={['event', 'events']} />
      {view.rows.length === 0 ? (
        <p className="text-muted" data-testid="audit-empty">{filtered ? 'No event matches these filters.' : 'Nothing recorded yet.'}</p>
      ) : (
        // On a phone each event stacks into a card; from sm up it is a table row.
        <div className="overflow-x-auto rounded-card border border-rule">
          <table className="w-full border-collapse text-sm max-sm:block" data-testid="audit-table">
            <caption className="sr-only">Audit log</caption>
            <thead className="bg-panel text-left text-xs text-muted max-sm:sr-only">
              <tr>
                <th scope="col" className="border-b border-rule px-2 py-1.5 font-medium">When (UTC)</th>
                <th scope="col" className="border-b border-rule px-2 py-1.5 font-medium">Who</th>
                <th scope="col" className="border-b border-rule px-2 py-1.5 font-medium">What</th>
                <th scope="col" className="border-b border-rule px-2 py-1.5 font-medium">On</th>
              </tr>
            </thead>
            <tbody className="max-sm:block">
              {view.rows.map((r) => (
                <tr key={r.id} data-testid="audit-row" data-action={r.action} className="align-top max-sm:block max-sm:border-b max-sm:border-rule/60 max-sm:py-1.5">
                  <td className={`figures whitespace-nowrap ${cell}`}>{r.at.replace('T', ' ').slice(0, 16)}</td>
                  <td className={`break-words ${cell}`}>
                    {r.actor.href ? <Link href={r.actor.href} className="hover:text-accent hover:underline">{r.actor.text}</Link> : <span className="text-muted">{r.actor.text}</span>}
                    {' '}<Link href={hrefWith('/admin/audit', {}, { actor: r.actor.filter })} className="text-xs text-muted underline underline-offset-2" aria-label={`Only events by ${r.actor.text}`}>only theirs</Link>
                  </td>
                  <td className={`sm:min-w-[12rem] ${cell}`}>
                    <Link href={hrefWith('/admin/audit', {}, { action: r.action })} className="font-medium hover:text-accent hover:underline">{r.actionLabel}</Link>
                    {r.summary ? <p className="break-words text-xs text-muted">{r.summary}</p> : null}
                  </td>
                  <td className={`break-words sm:whitespace-nowrap ${cell}`}>
                    {r.target ? (r.target.href ? <Link href={r.target.href} className="text-accent underline underline-offset-2">{r.target.text}</Link> : r.target.text) : '—'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
