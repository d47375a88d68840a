'use client';

import { useState } from 'react';
import { api } from '@/lib/api-client';
import { inputClass, buttonClass } from '@/components/forms/field';
import { StatusBadge } from './status-badge';

export type ThreadItem = { id: number; kind: string; body: string; createdAt: string; author: string; authorRole: string | null };

const DECISION_STATUS: Record<string, string> = { verify: 'verified', request_changes: 'changes_requested', reject: 'rejected' };

function when(iso: string) {
  const d = new Date(iso);
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}

/** Decisions, moderator notes and the contributor's answers, oldest first, with a box to add one. */
export function Thread(props: { submissionId: number; items: ThreadItem[]; canPost: boolean; placeholder?: string; onPosted?: () => void }) {
  const [items, setItems] = useState(props.items);
  const [body, setBody] = useState('');
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);

  async function post(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(undefined);
    const res = await api.submissions.addNote(props.submissionId, { body });
    setBusy(false);
    if (!res.ok) return setError(res.failure.details?.[0]?.message ?? res.failure.error);
    setItems((xs) => [...xs, { ...res.data, author: 'You', authorRole: null }]);
    setBody('');
    props.onPosted?.();
  }

  return (
    <section aria-labelledby="thread-heading" className="space-y-3">
      <h2 id="thread-heading" className="text-lg font-semibold">Thread</h2>
      {items.length === 0 ? <p className="text-sm text-muted">No notes yet.</p> : null}
      <ol className="space-y-2" data-testid="thread">
        {items.map((t) => (
          <li key={t.id} data-kind={t.kind} className={`rounded-card border border-rule p-3 text-sm ${t.kind === 'reply' ? 'bg-paper sm:ml-8' : 'bg-panel sm:mr-8'}`}>
            <div className="mb-1 flex flex-wrap items-center gap-2 text-xs text-muted">
              <span className="font-medium text-ink">{t.author}</span>
              <span>{t.kind === 'reply' ? 'contributor' : (t.authorRole ?? 'moderator')}</span>
              {DECISION_STATUS[t.kind] ? <StatusBadge status={DECISION_STATUS[t.kind]} /> : <span>{t.kind === 'reply' ? 'answered' : 'wrote'}</span>}
              <time dateTime={t.createdAt} className="figures ml-auto">{when(t.createdAt)}</time>
            </div>
            {t.body ? <p className="whitespace-pre-wrap">{t.body}</p> : <p className="text-muted">(no note)</p>}
          </li>
        ))}
      </ol>
      {props.canPost ? (
        <form onSubmit={post} className="space-y-2">
          <label htmlFor="thread-body" className="block text-sm font-medium">Add a note</label>
          <textarea id="thread-body" value={body} onChange={(e) => setBody(e.target.value)} rows={3} maxLength={4000}
            placeholder={props.placeholder} aria-invalid={!!error} aria-describedby={error ? 'thread-body-error' : undefined} className={inputClass} />
          {error ? <p id="thread-body-error" role="alert" className="text-sm text-bad">{error}</p> : null}
          <button type="submit" disabled={busy || !body.trim()} className={buttonClass}>{busy ? 'Sending…' : 'Send note'}</button>
        </form>
      ) : null}
    </section>
  );
}
