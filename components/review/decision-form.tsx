'use client';

import { useState } from 'react';
import { useRouter } from 'next/navigation';
import Link from 'next/link';
import { api } from '@/lib/api-client';
import { buttonClass, inputClass } from '@/components/forms/field';
import { StatusBadge } from './status-badge';

type Decision = 'verify' | 'request_changes' | 'reject';

const CHOICES: { value: Decision; word: string; help: string }[] = [
  { value: 'verify', word: 'Verify', help: 'The curve matches its method; publish it. It becomes public and cannot be edited afterwards.' },
  { value: 'request_changes', word: 'Request changes', help: 'Something is missing or doubtful; the contributor can answer and send a revision.' },
  { value: 'reject', word: 'Reject', help: 'Not usable data; the contributor is told why.' },
];

/** Verify, ask for changes or reject, each with a note; a decision someone else already made comes back as 409. */
export function DecisionForm({ submissionId }: { submissionId: number }) {
  const router = useRouter();
  const [decision, setDecision] = useState<Decision>();
  const [note, setNote] = useState('');
  const [error, setError] = useState<string>();
  const [noteError, setNoteError] = useState<string>();
  const [done, setDone] = useState<string>();
  const [busy, setBusy] = useState(false);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setError(undefined);
    setNoteError(undefined);
    if (!decision) return setError('Choose a decision.');
    if (decision !== 'verify' && !note.trim()) return setNoteError('Say why in the note: the contributor reads it.');
    setBusy(true);
    const res = await api.submissions.decide(submissionId, { decision, note });
    setBusy(false);
    if (res.ok) {
      setDone(res.data.status);
      router.refresh();
      return;
    }
    if (res.status === 409) {
      setError(`Another moderator decided first. ${res.failure.error}`);
      router.refresh();
      return;
    }
    const field = res.failure.details?.find((d) => d.field === 'note');
    if (field) setNoteError(field.message);
    setError(res.failure.error);
  }

  if (done) {
    return (
      <div role="status" className="space-y-2 rounded-card border border-ok/50 bg-ok/10 p-4 text-sm" data-testid="decision-done">
        <p>Decision recorded: <StatusBadge status={done} />. The contributor has been e-mailed.</p>
        <Link href="/review" className="text-accent underline underline-offset-2">Back to the queue</Link>
      </div>
    );
  }

  return (
    <form onSubmit={submit} className="space-y-4 rounded-card border border-rule bg-panel p-4" noValidate aria-labelledby="decide-heading">
      <h2 id="decide-heading" className="text-lg font-semibold">Decision</h2>
      <fieldset className="space-y-2">
        <legend className="sr-only">Decision</legend>
        {CHOICES.map((c) => (
          <label key={c.value} className={`flex cursor-pointer items-start gap-3 rounded-card border p-3 text-sm ${decision === c.value ? 'border-accent bg-accent/5' : 'border-rule'}`}>
            <input type="radio" name="decision" value={c.value} checked={decision === c.value} onChange={() => setDecision(c.value)} className="mt-1 accent-accent" />
            <span>
              <span className="font-medium">{c.word}</span>
              <span className="block text-muted">{c.help}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <div className="space-y-1">
        <label htmlFor="decision-note" className="block text-sm font-medium">
          Note to the contributor{decision && decision !== 'verify' ? <span className="text-bad" aria-label="required"> *</span> : null}
        </label>
        <textarea id="decision-note" rows={4} maxLength={4000} value={note} onChange={(e) => setNote(e.target.value)} className={inputClass}
          aria-invalid={!!noteError} aria-describedby={noteError ? 'decision-note-error' : 'decision-note-help'} />
        <p id="decision-note-help" className="text-xs text-muted">Required when asking for changes or rejecting. It goes into the thread and the e-mail.</p>
        {noteError ? <p id="decision-note-error" role="alert" className="text-sm text-bad">{noteError}</p> : null}
      </div>
      {error ? <p role="alert" className="rounded-card border border-bad/60 bg-bad/5 p-3 text-sm text-bad" data-testid="decision-error">{error}</p> : null}
      <button type="submit" disabled={busy} className={buttonClass}>{busy ? 'Recording…' : 'Record the decision'}</button>
    </form>
  );
}
