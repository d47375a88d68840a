'use client';

import { useState } from 'react';
import { signOut } from 'next-auth/react';
import { api } from '@/lib/api-client';

/** Ends every session of this account (other browsers and devices, and this one). */
export function SignOutEverywhere({ sessions }: { sessions: number }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string>();
  async function onClick() {
    setBusy(true);
    setError(undefined);
    const res = await api.account.signOutEverywhere();
    if (!res.ok) {
      setError(res.failure.error);
      setBusy(false);
      return;
    }
    await signOut({ callbackUrl: '/signin' });
  }
  return (
    <div className="space-y-2 text-sm">
      <p className="text-muted">
        Signed in on <span className="figures" data-testid="live-sessions">{sessions}</span> {sessions === 1 ? 'browser or device' : 'browsers or devices'}.
      </p>
      <button type="button" onClick={onClick} disabled={busy} className="rounded-card border border-rule px-3 py-2 hover:border-accent">
        Sign out everywhere
      </button>
      {error ? <p role="alert" className="text-bad">{error}</p> : null}
    </div>
  );
}
