'use client';

import { useState } from 'react';
import { api, type UserAccessChange } from '@/lib/api-client';
import { ACCESS_LABELS, ROLE_LABELS } from '@/lib/labels';
import type { UserRowView } from '@/lib/admin/users';

const th = 'border-b border-rule px-2 py-1.5 text-left text-xs font-medium text-muted';
// On a phone each user stacks into a card; from sm up it is a table row.
const td = 'border-b border-rule/60 px-2 py-1.5 align-top max-sm:block max-sm:border-0 max-sm:py-0.5';

/** The state is a badge; changing it is a button that asks first. */
function AccessBadge({ disabled }: { disabled: boolean }) {
  return (
    <span data-testid="access-badge" data-access={disabled ? 'disabled' : 'active'}
      className={`inline-flex whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${disabled ? 'border-bad/50 bg-bad/10 text-bad' : 'border-ok/50 bg-ok/10 text-ok'}`}>
      {disabled ? `⛔ ${ACCESS_LABELS.disabled}` : `✓ ${ACCESS_LABELS.active}`}
    </span>
  );
}

export function UsersTable({ rows: initial, selfId }: { rows: UserRowView[]; selfId: string }) {
  const [rows, setRows] = useState(initial);
  const [message, setMessage] = useState<string>();
  const [confirming, setConfirming] = useState<string | null>(null);

  async function change(id: string, body: UserAccessChange) {
    setConfirming(null);
    const res = await api.admin.changeUser(id, body);
    if (!res.ok) return setMessage(res.failure.error);
    setRows((rs) => rs.map((r) => (r.id === id ? { ...r, role: res.data.role, disabled: res.data.disabled } : r)));
    setMessage(`Saved: ${res.data.email} is ${ROLE_LABELS[res.data.role].toLowerCase()}, ${res.data.disabled ? 'disabled' : 'active'}.`);
  }

  return (
    <div className="space-y-2">
      {message ? <p role="status" className="text-sm">{message}</p> : null}
      <div className="overflow-x-auto rounded-card border border-rule">
        <table className="w-full border-collapse text-sm max-sm:block" data-testid="users-table">
          <caption className="sr-only">Users</caption>
          <thead className="bg-panel max-sm:sr-only">
            <tr>
              <th scope="col" className={th}>User</th>
              <th scope="col" className={th}>Role</th>
              <th scope="col" className={th}>State</th>
              <th scope="col" className={th}>Joined</th>
            </tr>
          </thead>
          <tbody className="max-sm:block">
            {rows.map((r) => {
              const self = r.id === selfId;
              const verb = r.disabled ? 'Enable' : 'Disable';
              return (
                <tr key={r.id} data-testid="user-row" data-email={r.email} className="max-sm:block max-sm:border-b max-sm:border-rule/60 max-sm:py-1.5">
                  <td className={`${td} break-words`}>
                    <span className="font-medium">{r.name || 'unnamed'}</span>
                    <span className="block text-xs text-muted">{r.email}{r.confirmed ? '' : ' · e-mail not confirmed yet'}</span>
                  </td>
                  <td className={td}>
                    <select aria-label={`Role of ${r.email}`} value={r.role} disabled={self} onChange={(e) => change(r.id, { role: e.target.value as UserAccessChange['role'] })}
                      className="rounded-card border border-rule bg-panel px-2 py-1 disabled:opacity-60">
                      {Object.entries(ROLE_LABELS).map(([k, v]) => <option key={k} value={k}>{v}</option>)}
                    </select>
                  </td>
                  <td className={`${td} space-y-1 max-sm:flex max-sm:flex-wrap max-sm:items-start max-sm:gap-2 max-sm:space-y-0`}>
                    <AccessBadge disabled={r.disabled} />
                    {self ? (
                      <span className="block text-xs text-muted">your own account</span>
                    ) : confirming === r.id ? (
                      <div role="group" aria-label={`Confirm: ${verb.toLowerCase()} ${r.email}`} className="space-y-1 text-xs">
                        <p>{r.disabled ? `${r.email} may sign in again.` : `${r.email} is signed out everywhere and cannot sign in.`}</p>
                        <div className="flex flex-wrap gap-2">
                          <button type="button" onClick={() => change(r.id, { disabled: !r.disabled })}
                            className={`rounded-card px-2 py-1 ${r.disabled ? 'bg-accent text-accent-ink' : 'bg-bad text-accent-ink'}`}>
                            Yes, {verb.toLowerCase()}
                          </button>
                          <button type="button" onClick={() => setConfirming(null)} className="rounded-card border border-rule px-2 py-1">Cancel</button>
                        </div>
                      </div>
                    ) : (
                      <button type="button" onClick={() => setConfirming(r.id)} aria-label={`${verb} ${r.email}…`}
                        className="block rounded-card border border-rule px-2 py-0.5 text-xs hover:border-accent">
                        {verb}…
                      </button>
                    )}
                  </td>
                  <td className={`${td} figures whitespace-nowrap text-xs text-muted sm:text-sm sm:text-ink`}><span className="sm:hidden">joined </span>{r.createdAt.slice(0, 10)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
